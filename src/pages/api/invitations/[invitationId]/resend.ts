import type { APIRoute } from 'astro';
import { invitationActionSchema } from '../../../../lib/account-forms';
import { parseJsonBody } from '../../../../lib/server/api-body';
import { db } from '../../../../lib/server/db';
import { requireRole } from '../../../../lib/server/guard';
import { json, jsonError } from '../../../../lib/server/http';
import { resendInvitation } from '../../../../lib/server/invitations';
import { once } from '../../../../lib/server/request-ids';

/** Sends a pending or expired invitation again with a new link; the old link stops working. Body: `{ id }`. */
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
  const answer = await once(k, { userId: user.id, id: input.id, route: 'invitations.resend', body: input }, () =>
    resendInvitation(k, user, invitationId),
  );
  return json(answer.body, answer.status);
};
