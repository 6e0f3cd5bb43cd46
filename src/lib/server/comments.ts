/**
 * Comments on a case (docs/review.md): anchored to the case, a canal or an event; append-only.
 * Whoever may read the case may comment — its student (so they can answer), the attendings
 * assigned to the student, directors; anyone else is told there is no such case.
 */
import type { Knex } from 'knex';
import type { ReviewComment } from '../contract';
import { isRefusal, next } from '../rules/index';
import { readableCase, type CaseRow } from './access';
import { audit } from './audit';
import type { Answer } from './request-ids';
import type { CommentInput } from './review-bodies';
import type { CommentRow, UserRow } from './tables';
import { stateOf } from './reviews';

type Joined = CommentRow & Pick<UserRow, 'name' | 'role'>;

function toComment(r: Joined): ReviewComment {
  return {
    id: r.client_id,
    canalId: r.canal_id,
    eventId: r.event_id,
    authorId: r.author_id,
    authorName: r.name,
    authorRole: r.role,
    text: r.text,
    at: r.created_at,
  };
}

function commentRows(k: Knex) {
  return k('comments')
    .join('users', 'users.id', 'comments.author_id')
    .select('comments.*', 'users.name', 'users.role')
    .orderBy('comments.id');
}

/** Every comment of a case `user` may read, or null (answer 404). */
export async function caseComments(k: Knex, user: SessionUser, caseId: string): Promise<ReviewComment[] | null> {
  return (await readableCase(k, user, caseId)) ? commentsOf(k, caseId) : null;
}

/** Every comment of a case, oldest first. */
export async function commentsOf(k: Knex, caseId: string): Promise<ReviewComment[]> {
  return ((await commentRows(k).where('comments.case_id', caseId)) as Joined[]).map(toComment);
}

const bad = (error: string, field: string): Answer => ({ status: 400, body: { error, field } });

/** Adds a comment (POST /api/cases/{caseId}/comments); 201 with it, 404 for a case the user may not read. */
export async function addComment(
  k: Knex,
  user: SessionUser,
  caseId: string,
  input: CommentInput,
  now: Date = new Date(),
): Promise<Answer> {
  const found = await readableCase(k, user, caseId);
  if (!found) return { status: 404, body: { error: 'No such case.' } };
  const at = now.toISOString();
  return k.transaction(async (trx): Promise<Answer> => {
    const prior = await trx('comments').where({ client_id: input.id }).first('id', 'author_id', 'case_id');
    if (prior) {
      if (prior.author_id !== user.id || prior.case_id !== caseId)
        return {
          status: 409,
          body: { error: 'This request id was already used for a different request; send it again with a new id.' },
        };
      return {
        status: 201,
        body: { caseId, comment: toComment((await commentRows(trx).where('comments.id', prior.id).first()) as Joined) },
      };
    }
    const row = (await trx('cases').where({ id: caseId }).first()) as CaseRow;
    const moved = next(stateOf(row), 'comment');
    if (isRefusal(moved))
      return {
        status: 409,
        body: { error: `${moved.refused.charAt(0).toUpperCase()}${moved.refused.slice(1)}.`, code: 'lifecycle' },
      };
    if (input.canalId !== undefined && !(await trx('canals').where({ id: input.canalId, case_id: caseId }).first('id')))
      return bad('canalId must name a canal of this case', 'canalId');
    if (input.eventId !== undefined) {
      const event = await trx('events').where({ id: input.eventId, case_id: caseId }).first('canal_id');
      if (!event) return bad('eventId must name an event of this case', 'eventId');
      if (input.canalId !== undefined && event.canal_id !== input.canalId)
        return bad('eventId must name an event of the canal the comment is on', 'eventId');
    }
    const [inserted] = await trx('comments')
      .insert({
        client_id: input.id,
        case_id: caseId,
        canal_id: input.canalId ?? null,
        event_id: input.eventId ?? null,
        author_id: user.id,
        text: input.text.trim(),
        created_at: at,
      })
      .returning('id');
    const id = (inserted as { id: number }).id;
    // The case's ETag counts comments; updated_at moves too, for lists sorted by activity.
    await trx('cases').where({ id: caseId }).update({ updated_at: trx.fn.now() });
    await audit(trx, user.id, 'case.comment', 'case', caseId, { comment: id });
    return {
      status: 201,
      body: { caseId, comment: toComment((await commentRows(trx).where('comments.id', id).first()) as Joined) },
    };
  });
}
