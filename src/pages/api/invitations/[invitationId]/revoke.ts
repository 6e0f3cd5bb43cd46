import type { APIRoute } from 'astro';
import { invitationActionSchema } from '../../../../lib/account-forms';
import { parseJsonBody } from '../../../../lib/server/api-body';
import { db } from '../../../../lib/server/db';
import { requireRole } from '../../../../lib/server/guard';
import { json, jsonError } from '../../../../lib/server/http';
import { revokeInvitation } from '../../../../lib/server/invitations';
import { once } from '../../../../lib/server/request-ids';

/** Revokes an invitation that is not accepted; its link stops working. Body: `{ id }`. */
export const POST: APIRoute = async (ctx) => {
  const denied = await requireRole(ctx, ['director']);
  if (denied) return denied;
  const user = ctx.locals.user!;
  const invitationId = Number(ctx.params.invitationId);
  if (!Number.isSafeInteger(invitationId) || invitationId <= 0) return jsonError(404, 'There is no such invitation.');
  const body = await parseJsonBody(ctx.request, invitationActionSchema, 1024);
  if (!body.ok) return body.response;
  const k = await db();
  const input = { ...body.value, invitationId };
  const answer = await once(k, { userId: user.id, id: input.id, route: 'invitations.revoke', body: input }, () =>
    revokeInvitation(k, user, invitationId),
  );
  return json(answer.body, answer.status);
};
