import type { APIRoute } from 'astro';
import { changePassword, passwordChangeSchema } from '../../../lib/server/account';
import { readBody } from '../../../lib/server/body';
import { db } from '../../../lib/server/db';
import { isJson, json, jsonError, sameOrigin } from '../../../lib/server/http';
import { once } from '../../../lib/server/request-ids';

/** Changes the signed-in user's own password (current password required). */
export const POST: APIRoute = async ({ request, locals, clientAddress }) => {
  const user = locals.user;
  if (!user || !locals.sessionId) return jsonError(401, 'Sign in first.');
  if (!sameOrigin(request)) return jsonError(403, 'This request did not come from Coneline.');
  if (!isJson(request)) return jsonError(415, 'Send the form as application/json.');
  const body = await readBody(request, 8192).catch(() => null);
  if (!body) return jsonError(400, 'The body could not be read.');
  if (body.tooLarge) return jsonError(413, 'The form is too large.');
  let raw: unknown;
  try {
    raw = JSON.parse(body.text);
  } catch {
    return jsonError(400, 'The body is not valid JSON.');
  }
  const input = passwordChangeSchema.safeParse(raw);
  if (!input.success) return jsonError(400, input.error.issues[0]?.message ?? 'Not a password change.');
  const sessionId = locals.sessionId;
  const k = await db();
  const answer = await once(k, { userId: user.id, id: input.data.id, route: 'me.password', body: input.data }, () =>
    changePassword(k, { userId: user.id, sessionId, address: clientAddress }, input.data),
  );
  return json(answer.body, answer.status);
};
