/**
 * The one way the director's account and cohort routes read a request: the role first (401,
 * 403), then the body (parseJsonBody: origin, JSON, size, zod, 400 naming the field), then the
 * request id (the same id again answers the first answer, with another body 409), then one
 * service call. Keeps each route file to a few lines.
 */
import type { APIContext } from 'astro';
import type { z } from 'zod';
import { parseJsonBody } from './api-body';
import { db } from './db';
import { requireRole } from './guard';
import { json, jsonError } from './http';
import { once, type Answer } from './request-ids';

type Ctx = Pick<APIContext, 'locals' | 'routePattern' | 'url' | 'redirect' | 'rewrite' | 'request' | 'params'>;
type Knex = Awaited<ReturnType<typeof db>>;

/** A path parameter that names a row by its number, or null (answered 404: no such row). */
export function rowParam(value: string | undefined): number | null {
  return value !== undefined && /^[1-9]\d{0,9}$/.test(value) ? Number(value) : null;
}

/** A director's read: the role, then `read`. */
export async function directorRead(ctx: Ctx, read: (k: Knex, user: SessionUser) => Promise<Answer>): Promise<Response> {
  const denied = await requireRole(ctx, ['director']);
  if (denied) return denied;
  const answer = await read(await db(), ctx.locals.user!);
  return json(answer.body, answer.status);
}

/**
 * A director's write of `schema` under request-id route `route` (the path's row included, so
 * the same id on another row is another request: 409).
 */
export async function directorWrite<S extends z.ZodTypeAny>(
  ctx: Ctx,
  schema: S,
  route: string,
  write: (k: Knex, user: SessionUser, input: z.infer<S>) => Promise<Answer>,
): Promise<Response> {
  const denied = await requireRole(ctx, ['director']);
  if (denied) return denied;
  const user = ctx.locals.user!;
  const body = await parseJsonBody(ctx.request, schema);
  if (!body.ok) return body.response;
  const input = body.value as z.infer<S> & { id: string };
  const k = await db();
  const answer = await once(k, { userId: user.id, id: input.id, route, body: input }, () => write(k, user, input));
  return json(answer.body, answer.status);
}

export const noSuchRow = (what: string): Response => jsonError(404, `No such ${what}.`);
