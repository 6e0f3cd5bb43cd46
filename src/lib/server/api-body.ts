/** Reading a JSON write's body the one way every review route does: origin, type, size, zod. */
import type { z } from 'zod';
import { formatZodError } from '../rules/index';
import { readBody } from './body';
import { isJson, jsonError, sameOrigin } from './http';

/** The top-level field the first problem is about (`field` in a 400 answer), if any. */
export function fieldOf(err: z.ZodError): string | undefined {
  const first = err.issues[0]?.path[0];
  return typeof first === 'string' ? first : undefined;
}

export type Parsed<T> = { ok: true; value: T; raw: unknown } | { ok: false; response: Response };

/**
 * The body of a state-changing JSON request checked against `schema`: 403 from another origin,
 * 415 when not JSON, 413 past `maxBytes`, 400 with the first problem in plain words and the
 * field it is about (`field`: the top-level one, unless `fieldOfError` names another, as the
 * settings do for the setting inside `values`).
 */
export async function parseJsonBody<S extends z.ZodTypeAny>(
  request: Request,
  schema: S,
  maxBytes = 16_384,
  fieldOfError: (error: z.ZodError) => string | undefined = fieldOf,
): Promise<Parsed<z.infer<S>>> {
  const fail = (status: number, error: string, field?: string): Parsed<z.infer<S>> => ({
    ok: false,
    response: jsonError(status, error, field ? { field } : undefined),
  });
  if (!sameOrigin(request)) return fail(403, 'This request did not come from Coneline.');
  if (!isJson(request)) return fail(415, 'Send the body as application/json.');
  const body = await readBody(request, maxBytes).catch(() => null);
  if (!body) return fail(400, 'The body could not be read.');
  if (body.tooLarge) return fail(413, 'The body is too large.');
  let raw: unknown;
  try {
    raw = JSON.parse(body.text);
  } catch {
    return fail(400, 'The body is not valid JSON.');
  }
  const input = schema.safeParse(raw);
  if (!input.success) return fail(400, formatZodError(input.error), fieldOfError(input.error));
  return { ok: true, value: input.data as z.infer<S>, raw };
}
