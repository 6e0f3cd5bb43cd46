/**
 * Sign-offs and reopening (docs/review.md): an attending assigned to the student, or a
 * director, signs off a checkpoint or the whole case, or reopens a signed-off case. Every
 * sign-off is a new row, never changed (a reopening only marks the final approval it
 * supersedes); the row, the case's move through the lifecycle, its audit line and its e-mail
 * are written in one transaction, and the e-mail is sent after commit.
 */
import type { Knex } from 'knex';
import type { CanalRatings, Signoff } from '../contract';
import {
  CASE_STATE_LABELS,
  finalApprovalRefusal,
  isRefusal,
  next,
  type CaseAction,
  type CaseState,
} from '../rules/index';
import { isUnfilled } from '../present/labels';
import { readableCase, type CaseRow } from './access';
import { audit } from './audit';
import { REMOVED } from './canal-store';
import { noticeStudent } from './mail-notices';
import { kickMail } from './mail-worker';
import { reviewCase } from './projection';
import type { Answer } from './request-ids';
import type { ReopenInput, SignoffInput } from './review-bodies';
import type { SignoffRow } from './tables';

const NO_CASE: Answer = { status: 404, body: { error: 'No such case.' } };
const NOT_REVIEWER: Answer = {
  status: 403,
  body: { error: 'Only an attending assigned to the student, or a director, may sign off or reopen a case.' },
};

/** The case for a reviewer's write: 404 when `user` may not read it, 403 when they may read but not review it. */
export async function reviewableCase(k: Knex, user: SessionUser, caseId: string): Promise<CaseRow | Answer> {
  const row = await readableCase(k, user, caseId);
  if (!row) return NO_CASE;
  // readableCase lets an attending read only their assigned students' cases.
  if (user.role !== 'attending' && user.role !== 'director') return NOT_REVIEWER;
  return row;
}

/** True for a refusal from `reviewableCase` rather than the case. */
export const isAnswer = (x: CaseRow | Answer): x is Answer => 'status' in x && 'body' in x;

/** The lifecycle state of a case row: `discarded` while a discard stands, else its review state. */
export const stateOf = (row: Pick<CaseRow, 'review_status' | 'discarded_at'>): CaseState =>
  row.discarded_at === null ? row.review_status : 'discarded';

/** Ratings stored in the shape of this API, or null (older rows hold another shape). */
function ratingsOf(json: string | null): Record<string, CanalRatings> | null {
  if (!json) return null;
  try {
    const v = JSON.parse(json) as unknown;
    if (!v || typeof v !== 'object') return null;
    const ok = Object.values(v).every(
      (r) =>
        r !== null &&
        typeof r === 'object' &&
        Object.values(r as object).every((n) => Number.isInteger(n) && (n as number) >= 1 && (n as number) <= 4),
    );
    return ok ? (v as Record<string, CanalRatings>) : null;
  } catch {
    return null;
  }
}

/** A stored sign-off as readers see it. */
export function toSignoff(r: SignoffRow & { attending_name: string }): Signoff {
  return {
    id: r.client_id,
    checkpoint: r.checkpoint,
    canalId: r.canal_id,
    decision: r.decision,
    ratings: ratingsOf(r.rubric_json),
    comment: r.comment,
    attendingId: r.attending_id,
    attendingName: r.attending_name,
    at: r.created_at,
    supersededAt: r.superseded_at,
  };
}

function signoffRows(k: Knex) {
  return k('signoffs')
    .join('users', 'users.id', 'signoffs.attending_id')
    .select('signoffs.*', 'users.name as attending_name')
    .orderBy('signoffs.id');
}

/** Every sign-off of a case `user` may read, or null (answer 404). */
export async function caseSignoffs(k: Knex, user: SessionUser, caseId: string): Promise<Signoff[] | null> {
  return (await readableCase(k, user, caseId)) ? signoffsOf(k, caseId) : null;
}

/** Every sign-off of a case, oldest first. */
export async function signoffsOf(k: Knex, caseId: string): Promise<Signoff[]> {
  const rows = (await signoffRows(k).where('signoffs.case_id', caseId)) as (SignoffRow & { attending_name: string })[];
  return rows.map(toSignoff);
}

async function answerFor(trx: Knex, caseId: string, signoffId: number, status: number): Promise<Answer> {
  const row = (await signoffRows(trx).where('signoffs.id', signoffId).first()) as
    (SignoffRow & { attending_name: string }) | undefined;
  const c = await trx('cases').where({ id: caseId }).first('review_status');
  return { status, body: { caseId, reviewStatus: c!.review_status, signoff: toSignoff(row!) } };
}

/** A sign-off already stored under this client id (its request-id row lost to a crash): the same answer, or 409. */
async function replay(trx: Knex, clientId: string, userId: number, caseId: string): Promise<Answer | null> {
  const prior = await trx('signoffs').where({ client_id: clientId }).first('id', 'attending_id', 'case_id');
  if (!prior) return null;
  if (prior.attending_id !== userId || prior.case_id !== caseId)
    return {
      status: 409,
      body: { error: 'This request id was already used for a different request; send it again with a new id.' },
    };
  return answerFor(trx, caseId, prior.id, 201);
}

/** Live canals of a case: their names, stops and whether each is unfilled. */
async function liveCanals(trx: Knex, caseId: string) {
  const rows = (await trx('canals')
    .select('id', 'name', 'stops', 'state_json')
    .where({ case_id: caseId })
    .whereNot('status', REMOVED)
    .orderBy('id')) as { id: string; name: string; stops: number; state_json: string }[];
  return rows.map((r) => {
    const state = JSON.parse(r.state_json || '{}') as { unfilled?: boolean; masterCone?: { seated: boolean } | null };
    return {
      id: r.id,
      name: r.name,
      stops: r.stops,
      unfilled: isUnfilled({ ...state, masterCone: state.masterCone ?? null }),
    };
  });
}

const conflict = (error: string, code: string, extra: Record<string, unknown> = {}): Answer => ({
  status: 409,
  body: { error, code, ...extra },
});

/** 409: the case is no longer in the state the attending saw. */
function stateChanged(state: CaseState, expected: CaseState): Answer {
  return conflict(
    `This case is now "${CASE_STATE_LABELS[state]}", not "${CASE_STATE_LABELS[expected]}": it changed since you opened it. Reload it and decide again.`,
    'state-changed',
    { state },
  );
}

/**
 * Signs off a checkpoint or the whole case (POST /api/cases/{caseId}/signoffs). Answers 201
 * with the stored sign-off; 409 when the case is no longer in `expectedState`, when the
 * lifecycle refuses the move, or when a final approval would leave an open stop or an
 * unfilled canal; 400 for a canal that is not the case's.
 */
export async function signOff(
  k: Knex,
  user: SessionUser,
  caseId: string,
  input: SignoffInput,
  now: Date = new Date(),
): Promise<Answer> {
  const found = await reviewableCase(k, user, caseId);
  if (isAnswer(found)) return found;
  const at = now.toISOString();
  const answer = await k.transaction(async (trx): Promise<Answer> => {
    const again = await replay(trx, input.id, user.id, caseId);
    if (again) return again;
    // Read inside the transaction: two attendings deciding at once are serialised here.
    const row = (await trx('cases').where({ id: caseId }).first()) as CaseRow;
    const state = stateOf(row);
    if (state !== input.expectedState) return stateChanged(state, input.expectedState);
    const action: CaseAction =
      input.checkpoint !== 'final' ? 'checkpoint' : input.decision === 'approve' ? 'approve' : 'return';
    const moved = next(state, action);
    if (isRefusal(moved)) return conflict(`${capital(moved.refused)}.`, 'lifecycle', { state });
    const canals = await liveCanals(trx, caseId);
    const ids = new Set(canals.map((c) => c.id));
    if (input.canalId !== undefined && !ids.has(input.canalId))
      return { status: 400, body: { error: 'canalId must name a canal of this case', field: 'canalId' } };
    const stranger = Object.keys(input.ratings ?? {}).find((id) => !ids.has(id));
    if (stranger)
      return {
        status: 400,
        body: { error: `ratings name ${stranger}, which is not a canal of this case`, field: 'ratings' },
      };
    if (action === 'approve') {
      const blocked = finalApprovalRefusal({
        stops: canals.reduce((n, c) => n + c.stops, 0),
        unfilled: canals.filter((c) => c.unfilled).map((c) => c.name),
      });
      if (blocked) return conflict(`${capital(blocked.refused)}.`, 'open-problems', { state });
    }
    const [inserted] = await trx('signoffs')
      .insert({
        client_id: input.id,
        case_id: caseId,
        canal_id: input.canalId ?? null,
        checkpoint: input.checkpoint,
        decision: input.decision === 'approve' ? 'approved' : 'returned',
        rubric_json: input.ratings ? JSON.stringify(input.ratings) : null,
        comment: input.comment ?? null,
        attending_id: user.id,
        created_at: at,
      })
      .returning('id');
    const signoffId = (inserted as { id: number }).id;
    if (action === 'approve' || action === 'return') await reviewCase(trx, caseId, action, at);
    else await trx('cases').where({ id: caseId }).update({ updated_at: trx.fn.now() });
    await audit(trx, user.id, 'case.signoff', 'case', caseId, {
      signoff: signoffId,
      checkpoint: input.checkpoint,
      decision: input.decision,
      ...(input.canalId ? { canalId: input.canalId } : {}),
    });
    if (input.decision === 'return' || action === 'approve') {
      const canalName = canals.find((c) => c.id === input.canalId)?.name ?? null;
      await noticeStudent(trx, caseId, input.decision === 'return' ? 'returned' : 'approved', at, {
        checkpoint: input.checkpoint,
        canalName,
      });
    }
    return answerFor(trx, caseId, signoffId, 201);
  });
  kickMail();
  return answer;
}

const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

/**
 * Reopens a signed-off case (POST /api/cases/{caseId}/reopen): the case returns to open, the
 * standing final approval is marked superseded (kept), and a `reopened` sign-off row with the
 * reason, an audit line and a notice to the student are written. 409 when the case is not
 * signed off.
 */
export async function reopen(
  k: Knex,
  user: SessionUser,
  caseId: string,
  input: ReopenInput,
  now: Date = new Date(),
): Promise<Answer> {
  const found = await reviewableCase(k, user, caseId);
  if (isAnswer(found)) return found;
  const at = now.toISOString();
  const answer = await k.transaction(async (trx): Promise<Answer> => {
    const again = await replay(trx, input.id, user.id, caseId);
    if (again) return again;
    const row = (await trx('cases').where({ id: caseId }).first()) as CaseRow;
    const state = stateOf(row);
    if (input.expectedState !== undefined && state !== input.expectedState)
      return stateChanged(state, input.expectedState);
    const moved = next(state, 'reopen');
    if (isRefusal(moved)) return conflict(`${capital(moved.refused)}.`, 'lifecycle', { state });
    const approval = await trx('signoffs')
      .where({ case_id: caseId, checkpoint: 'final', decision: 'approved' })
      .whereNull('superseded_at')
      .orderBy('id', 'desc')
      .first('id');
    const [inserted] = await trx('signoffs')
      .insert({
        client_id: input.id,
        case_id: caseId,
        canal_id: null,
        checkpoint: 'final',
        decision: 'reopened',
        rubric_json: null,
        comment: input.reason,
        attending_id: user.id,
        created_at: at,
      })
      .returning('id');
    const signoffId = (inserted as { id: number }).id;
    if (approval)
      await trx('signoffs').where({ id: approval.id }).update({ superseded_at: at, superseded_by: signoffId });
    await reviewCase(trx, caseId, 'reopen', at);
    await audit(trx, user.id, 'case.reopen', 'case', caseId, {
      signoff: signoffId,
      ...(approval ? { supersedes: approval.id } : {}),
    });
    await noticeStudent(trx, caseId, 'reopened', at);
    return answerFor(trx, caseId, signoffId, 201);
  });
  kickMail();
  return answer;
}
