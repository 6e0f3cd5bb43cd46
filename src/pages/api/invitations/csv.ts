import type { APIRoute } from 'astro';
import { inviteCsvSchema, MAX_CSV_CHARS } from '../../../lib/account-forms';
import { parseJsonBody } from '../../../lib/server/api-body';
import { db } from '../../../lib/server/db';
import { requireRole } from '../../../lib/server/guard';
import { json } from '../../../lib/server/http';
import { inviteFromCsv } from '../../../lib/server/invitation-csv';
import { once } from '../../../lib/server/request-ids';

/** Invites a cohort from CSV text of `name,email` rows: `{ id, csv, role, cohortId?, attendingIds? }`. */
export const POST: APIRoute = async (ctx) => {
  const denied = await requireRole(ctx, ['director']);
  if (denied) return denied;
  const user = ctx.locals.user!;
  // Room for the CSV at its longest, every character escaped in JSON, and the other fields.
  const body = await parseJsonBody(ctx.request, inviteCsvSchema, MAX_CSV_CHARS * 6 + 4096);
  if (!body.ok) return body.response;
  const k = await db();
  const input = body.value;
  const answer = await once(k, { userId: user.id, id: input.id, route: 'invitations.csv', body: input }, () =>
    inviteFromCsv(k, user, input),
  );
  return json(answer.body, answer.status);
};
