/**
 * What the case page (the review page for attendings and directors, the case page for the
 * student) reads, through one service: the case, who may do what on it, and the history of
 * each canal's findings with the event that raised each. Who may sign off is the sign-off
 * service's own answer (`reviewableCase`), never a role check of the page's.
 */
import type { Knex } from 'knex';
import type { Signoff } from '../contract';
import { FINDINGS, isRefusal, next, type CaseState, type Severity } from '../rules/index';
import { readableCases, UUID_RE } from './access';
import { caseDetail, type CaseDetail } from './cases';
import { db } from './db';
import { isAnswer, reviewableCase, stateOf, toSignoff } from './reviews';
import type { SignoffRow } from './tables';

/** One finding as it was raised and, once put right, cleared. */
export interface FindingHistoryEntry {
  canalId: string;
  code: string;
  /** The catalogue's severity of the code; a code this server does not know counts as a note. */
  severity: Severity;
  /** The event that raised it, where there is one. */
  eventId: string | null;
  raisedAt: string;
  /** Null while the finding is open. */
  clearedAt: string | null;
}

/** Every finding ever raised on the case's canals, oldest first. */
export async function findingHistoryOf(k: Knex, caseId: string): Promise<FindingHistoryEntry[]> {
  const rows = (await k('finding_history as h')
    .join('canals as c', 'c.id', 'h.canal_id')
    .where('c.case_id', caseId)
    .orderBy('h.id')
    .select('h.canal_id', 'h.code', 'h.event_id', 'h.first_raised_at', 'h.cleared_at')) as {
    canal_id: string;
    code: string;
    event_id: string | null;
    first_raised_at: string;
    cleared_at: string | null;
  }[];
  return rows.map((r) => ({
    canalId: r.canal_id,
    code: r.code,
    severity: Object.hasOwn(FINDINGS, r.code) ? FINDINGS[r.code as keyof typeof FINDINGS].severity : 'note',
    eventId: r.event_id,
    raisedAt: r.first_raised_at,
    clearedAt: r.cleared_at,
  }));
}

export interface CaseReviewPage extends CaseDetail {
  studentName: string;
  /** The case's lifecycle state (`discarded` while a discard stands). */
  state: CaseState;
  history: FindingHistoryEntry[];
  /** The user may sign off checkpoints, approve or return the case, and reopen it. */
  mayReview: boolean;
  /** The case takes comments now (it does unless discarded); whoever may read it may comment. */
  mayComment: boolean;
}

/** The case page's data, or null when the case is not there or not the user's to read (answer 404). */
export async function caseReviewPage(user: SessionUser, caseId: string): Promise<CaseReviewPage | null> {
  if (!UUID_RE.test(caseId)) return null;
  const k = await db();
  const detail = await caseDetail(k, user, caseId);
  if (!detail) return null;
  const student = await k('users').where({ id: detail.case.student_id }).first('name');
  const state = stateOf(detail.case);
  return {
    ...detail,
    studentName: student?.name ?? '',
    state,
    history: await findingHistoryOf(k, caseId),
    mayReview: !isAnswer(await reviewableCase(k, user, caseId)),
    mayComment: !isRefusal(next(state, 'comment')),
  };
}

/**
 * The sign-offs of every case `user` may read, oldest first, by case id: the student's home
 * page shows the latest of them and why a case came back.
 */
export async function signoffsByCase(user: SessionUser): Promise<Map<string, Signoff[]>> {
  const k = await db();
  const rows = (await k('signoffs')
    .join('users', 'users.id', 'signoffs.attending_id')
    .select('signoffs.*', 'users.name as attending_name')
    .whereIn('signoffs.case_id', readableCases(k, user).select('cases.id'))
    .orderBy('signoffs.id')) as (SignoffRow & { attending_name: string })[];
  const out = new Map<string, Signoff[]>();
  for (const r of rows) out.set(r.case_id, [...(out.get(r.case_id) ?? []), toSignoff(r)]);
  return out;
}
