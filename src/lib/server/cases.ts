/** Case lists and case detail for the API and the pages. */
import { createHash } from 'node:crypto';
import type { Knex } from 'knex';
import type { CaseSummary, ReviewComment, Signoff } from '../contract';
import type { CanalResult, LogEvent } from '../rules/index';
import { readableCase, readableCases, type CaseRow } from './access';
import { caseEvents, REMOVED, storedCanalsOfCase } from './canal-store';
import { commentsOf } from './comments';
import { signoffsOf } from './reviews';
import { settingsVersion } from './settings';

export type { CaseSummary } from '../contract';

/**
 * The cases `user` may read, newest first, with their canals and finding counts. `refine` adds
 * to the query (more conditions, a tie-break order, a limit): the case list's filters.
 */
export async function listCases(
  k: Knex,
  user: SessionUser,
  filter: {
    reviewStatus?: CaseRow['review_status'][];
    studentId?: number;
    refine?: (q: Knex.QueryBuilder) => void;
  } = {},
): Promise<CaseSummary[]> {
  const q = readableCases(k, user)
    .join('users', 'users.id', 'cases.student_id')
    .select('cases.*', 'users.name as student_name')
    // A discarded case leaves every list (docs/lifecycle.md); its page still opens.
    .whereNull('cases.discarded_at')
    .orderBy('cases.opened_at', 'desc');
  if (filter.reviewStatus) q.whereIn('cases.review_status', filter.reviewStatus);
  if (filter.studentId) q.where('cases.student_id', filter.studentId);
  filter.refine?.(q);
  const rows: (CaseRow & { student_name: string })[] = await q;
  const canalRows = rows.length
    ? await k('canals')
        .select('id', 'case_id', 'name', 'status', 'stops', 'cautions', 'notes')
        .whereIn(
          'case_id',
          rows.map((r) => r.id),
        )
        .whereNot('status', REMOVED)
        .orderBy('id')
    : [];
  return rows.map((r) => {
    const canals = canalRows.filter((c) => c.case_id === r.id);
    const sum = (key: 'stops' | 'cautions' | 'notes') => canals.reduce((n, c) => n + c[key], 0);
    return {
      caseId: r.id,
      studentId: r.student_id,
      studentName: r.student_name,
      setting: r.setting,
      tooth: r.tooth,
      chartRef: r.chart_ref,
      openedAt: r.opened_at,
      submittedAt: r.submitted_at,
      submitted: r.submitted_at !== null,
      reviewStatus: r.review_status,
      stops: sum('stops'),
      cautions: sum('cautions'),
      notes: sum('notes'),
      canals: canals.map((c) => ({ canalId: c.id, name: c.name, status: c.status })),
    };
  });
}

export interface CaseDetail {
  caseId: string;
  case: CaseRow;
  events: LogEvent[];
  canals: CanalResult[];
  signoffs: Signoff[];
  comments: ReviewComment[];
  /** The settings version in force when it was read. */
  settingsVersion: number;
}

/** One case with every stored event and each canal's state, or null when not readable. */
export async function caseDetail(k: Knex, user: SessionUser, caseId: string): Promise<CaseDetail | null> {
  const row = await readableCase(k, user, caseId);
  if (!row) return null;
  const events = (await caseEvents(k, caseId)).sort(
    (a, b) => Date.parse(a.at) - Date.parse(b.at) || (a.id < b.id ? -1 : 1),
  );
  const canals = await storedCanalsOfCase(k, caseId);
  // In the order the canals were set up, as the student met them.
  const setUp = events.filter((e) => e.type === 'canal.added').map((e) => e.canalId);
  canals.sort((a, b) => setUp.indexOf(a.canalId) - setUp.indexOf(b.canalId));
  return {
    caseId,
    case: row,
    events,
    canals,
    signoffs: await signoffsOf(k, caseId),
    comments: await commentsOf(k, caseId),
    settingsVersion: await settingsVersion(k),
  };
}

// Bump when the case answer's shape changes, so a tablet's stored ETag stops matching.
const CASE_ANSWER_FORMAT = 'c2';

/**
 * The case's data version as a strong ETag: a hash of everything GET /api/cases/{id} answers
 * from — the case row's review status, submission, sign-off and updated_at; the count, last
 * rowid and last received_at of its events (never edited, only added); the count and latest
 * updated_at of its canal rows; the count of its findings; the count, last id and last
 * superseding of its sign-offs and the count and last id of its comments; the settings version
 * (a change of the settings re-judges the canals, and the answer names the version). Every write that changes the answer
 * (a sync batch, a sign-off, a settings change) touches one of them; an unchanged case always hashes the same.
 * One indexed query, no events read: the cheap half of a conditional GET.
 */
export async function caseVersion(k: Knex, caseId: string): Promise<string | null> {
  const row = (await k('cases as c')
    .where('c.id', caseId)
    .first(
      'c.review_status',
      'c.submitted_at',
      'c.signed_off_at',
      'c.updated_at',
      'c.discarded_at',
      k.raw(
        "(select count(*) || ':' || coalesce(max(rowid), 0) || ':' || coalesce(max(received_at), '') from events where case_id = c.id) as ev",
      ),
      k.raw("(select count(*) || ':' || coalesce(max(updated_at), '') from canals where case_id = c.id) as ca"),
      k.raw('(select count(*) from findings where case_id = c.id) as fi'),
      k.raw(
        "(select count(*) || ':' || coalesce(max(id), 0) || ':' || coalesce(max(superseded_at), '') from signoffs where case_id = c.id) as so",
      ),
      k.raw("(select count(*) || ':' || coalesce(max(id), 0) from comments where case_id = c.id) as co"),
      k.raw('(select version from settings_version where id = 1) as sv'),
    )) as Record<string, unknown> | undefined;
  if (!row) return null;
  const hash = createHash('sha256')
    .update(JSON.stringify(Object.values(row)))
    .digest('base64url');
  return `"${CASE_ANSWER_FORMAT}-${hash.slice(0, 32)}"`;
}

/** Whether an If-None-Match header names `etag` (weak comparison, as RFC 9110 asks for this header). */
export function etagMatches(ifNoneMatch: string | null, etag: string): boolean {
  if (!ifNoneMatch) return false;
  if (ifNoneMatch.trim() === '*') return true;
  const bare = (t: string) => t.trim().replace(/^W\//, '');
  return ifNoneMatch.split(',').some((t) => bare(t) === bare(etag));
}

export type CaseRead =
  { kind: 'missing' } | { kind: 'unchanged'; etag: string } | { kind: 'changed'; etag: string; detail: CaseDetail };

/**
 * The case for a conditional GET: `unchanged` when the reader's ETag still names the case's
 * data version (nothing else is read), else the detail with its new ETag. The version is
 * taken before the detail, so an ETag never stands for an answer older than itself.
 */
export async function readCaseIfChanged(
  k: Knex,
  user: SessionUser,
  caseId: string,
  ifNoneMatch: string | null,
): Promise<CaseRead> {
  if (!(await readableCase(k, user, caseId))) return { kind: 'missing' };
  const etag = await caseVersion(k, caseId);
  if (etag === null) return { kind: 'missing' };
  if (etagMatches(ifNoneMatch, etag)) return { kind: 'unchanged', etag };
  const detail = await caseDetail(k, user, caseId);
  return detail ? { kind: 'changed', etag, detail } : { kind: 'missing' };
}
