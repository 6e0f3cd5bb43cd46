import type { APIRoute } from 'astro';
import { invitationActionSchema } from '../account-forms';
import { parseJsonBody } from './api-body';
import { db } from './db';
import { requireRole } from './guard';
import { json, jsonError } from './http';
import type { Knex } from 'knex';
import { once, type Answer } from './request-ids';

type Act = (k: Knex, director: NonNullable<App.Locals['user']>, invitationId: number) => Promise<Answer>;

/**
 * A director's action on one invitation (resend, revoke): body `{ id }`, the invitation's
 * number from the path (404 when it cannot be one), answered once per request id.
 */
export function invitationAction(route: string, act: Act): APIRoute {
  return async (ctx) => {
    const denied = await requireRole(ctx, ['director']);
    if (denied) return denied;
    const user = ctx.locals.user!;
    const invitationId = Number(ctx.params.invitationId);
    if (!Number.isSafeInteger(invitationId) || invitationId <= 0) return jsonError(404, 'There is no such invitation.');
    const body = await parseJsonBody(ctx.request, invitationActionSchema, 1024);
    if (!body.ok) return body.response;
    const k = await db();
    const input = { ...body.value, invitationId };
    const answer = await once(k, { userId: user.id, id: input.id, route, body: input }, () =>
      act(k, user, invitationId),
    );
    return json(answer.body, answer.status);
  };
}
