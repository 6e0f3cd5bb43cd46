import type { APIRoute } from 'astro';
import { inviteSchema } from '../../../lib/account-forms';
import { parseJsonBody } from '../../../lib/server/api-body';
import { db } from '../../../lib/server/db';
import { requireRole } from '../../../lib/server/guard';
import { json } from '../../../lib/server/http';
import { createInvitation, listInvitations } from '../../../lib/server/invitations';
import { once } from '../../../lib/server/request-ids';

/** Every invitation with its status (directors; docs/accounts.md). */
export const GET: APIRoute = async (ctx) => {
  const denied = await requireRole(ctx, ['director']);
  if (denied) return denied;
  return json({ invitations: await listInvitations(await db()) });
};

/** Invites one address: `{ id, email, name?, role, cohortId?, attendingIds? }`. */
export const POST: APIRoute = async (ctx) => {
  const denied = await requireRole(ctx, ['director']);
  if (denied) return denied;
  const user = ctx.locals.user!;
  const body = await parseJsonBody(ctx.request, inviteSchema, 8192);
  if (!body.ok) return body.response;
  const k = await db();
  const input = body.value;
  const answer = await once(k, { userId: user.id, id: input.id, route: 'invitations.create', body: input }, () =>
    createInvitation(k, user, input),
  );
  return json(answer.body, answer.status);
};
