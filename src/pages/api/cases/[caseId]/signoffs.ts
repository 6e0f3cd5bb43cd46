import type { APIRoute } from 'astro';
import { UUID_RE } from '../../../../lib/server/access';
import { parseJsonBody } from '../../../../lib/server/api-body';
import { db } from '../../../../lib/server/db';
import { json, jsonError } from '../../../../lib/server/http';
import { once } from '../../../../lib/server/request-ids';
import { signoffSchema } from '../../../../lib/server/review-bodies';
import { caseSignoffs, signOff } from '../../../../lib/server/reviews';

/** Every sign-off of the case, to whoever may read it (docs/review.md). */
export const GET: APIRoute = async ({ params, locals }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  const caseId = params.caseId ?? '';
  const signoffs = UUID_RE.test(caseId) ? await caseSignoffs(await db(), user, caseId) : null;
  if (!signoffs) return jsonError(404, 'No such case.');
  return json({ caseId, signoffs });
};

/** An attending's sign-off of a checkpoint or the whole case; the same id again answers the first answer. */
export const POST: APIRoute = async ({ params, locals, request }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  const body = await parseJsonBody(request, signoffSchema);
  if (!body.ok) return body.response;
  const caseId = params.caseId ?? '';
  if (!UUID_RE.test(caseId)) return jsonError(404, 'No such case.');
  const k = await db();
  const input = body.value;
  const answer = await once(k, { userId: user.id, id: input.id, route: `case.signoff ${caseId}`, body: input }, () =>
    signOff(k, user, caseId, input),
  );
  return json(answer.body, answer.status);
};
