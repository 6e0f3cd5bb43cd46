import type { APIRoute } from 'astro';
import { directorResetSchema } from '../../../../lib/account-forms';
import { parseJsonBody } from '../../../../lib/server/api-body';
import { db } from '../../../../lib/server/db';
import { requireRole } from '../../../../lib/server/guard';
import { json, jsonError } from '../../../../lib/server/http';
import { sendResetFor } from '../../../../lib/server/password-resets';
import { once } from '../../../../lib/server/request-ids';

/** A director sends the user an e-mail with a link to set a new password. Body: `{ id }`. */
export const POST: APIRoute = async (ctx) => {
  const denied = await requireRole(ctx, ['director']);
  if (denied) return denied;
  const user = ctx.locals.user!;
  const userId = Number(ctx.params.userId);
  if (!Number.isSafeInteger(userId) || userId <= 0) return jsonError(404, 'There is no such account.');
  const body = await parseJsonBody(ctx.request, directorResetSchema, 1024);
  if (!body.ok) return body.response;
  const k = await db();
  const input = { ...body.value, userId };
  const answer = await once(k, { userId: user.id, id: input.id, route: 'users.password-reset', body: input }, () =>
    sendResetFor(k, user.id, userId),
  );
  return json(answer.body, answer.status);
};
