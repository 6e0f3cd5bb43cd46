import type { APIRoute } from 'astro';
import { UUID_RE } from '../../../../lib/server/access';
import { parseJsonBody } from '../../../../lib/server/api-body';
import { db } from '../../../../lib/server/db';
import { json, jsonError } from '../../../../lib/server/http';
import { once } from '../../../../lib/server/request-ids';
import { reopenSchema } from '../../../../lib/server/review-bodies';
import { reopen } from '../../../../lib/server/reviews';

/** Returns a signed-off case to work, keeping every sign-off (docs/review.md). */
export const POST: APIRoute = async ({ params, locals, request }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  const body = await parseJsonBody(request, reopenSchema);
  if (!body.ok) return body.response;
  const caseId = params.caseId ?? '';
  if (!UUID_RE.test(caseId)) return jsonError(404, 'No such case.');
  const k = await db();
  const input = body.value;
  const answer = await once(k, { userId: user.id, id: input.id, route: `case.reopen ${caseId}`, body: input }, () =>
    reopen(k, user, caseId, input),
  );
  return json(answer.body, answer.status);
};
