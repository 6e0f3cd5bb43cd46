import type { APIRoute } from 'astro';
import { UUID_RE } from '../../../../lib/server/access';
import { parseJsonBody } from '../../../../lib/server/api-body';
import { addComment, caseComments } from '../../../../lib/server/comments';
import { db } from '../../../../lib/server/db';
import { json, jsonError } from '../../../../lib/server/http';
import { once } from '../../../../lib/server/request-ids';
import { commentSchema } from '../../../../lib/server/review-bodies';

/** Every comment of the case, to whoever may read it (docs/review.md). */
export const GET: APIRoute = async ({ params, locals }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  const caseId = params.caseId ?? '';
  const comments = UUID_RE.test(caseId) ? await caseComments(await db(), user, caseId) : null;
  if (!comments) return jsonError(404, 'No such case.');
  return json({ caseId, comments });
};

/** A comment on the case, a canal or an event, by its student, an assigned attending or a director. */
export const POST: APIRoute = async ({ params, locals, request }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  const body = await parseJsonBody(request, commentSchema);
  if (!body.ok) return body.response;
  const caseId = params.caseId ?? '';
  if (!UUID_RE.test(caseId)) return jsonError(404, 'No such case.');
  const k = await db();
  const input = body.value;
  const answer = await once(k, { userId: user.id, id: input.id, route: `case.comment ${caseId}`, body: input }, () =>
    addComment(k, user, caseId, input),
  );
  return json(answer.body, answer.status);
};
