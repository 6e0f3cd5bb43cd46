/** Case lists and case detail for the API and the pages. */
import type { Knex } from 'knex';
import type { CaseSummary } from '../contract';
import type { CanalResult, LogEvent } from '../rules/index';
import { readableCase, readableCases, type CaseRow } from './access';
import { caseEvents, REMOVED, storedCanalsOfCase } from './canal-store';

export type { CaseSummary } from '../contract';

/** The cases `user` may read, newest first, with their canals and finding counts. */
export async function listCases(
  k: Knex,
  user: SessionUser,
  filter: { reviewStatus?: CaseRow['review_status'][]; studentId?: number } = {},
): Promise<CaseSummary[]> {
  const q = readableCases(k, user)
    .join('users', 'users.id', 'cases.student_id')
    .select('cases.*', 'users.name as student_name')
    .orderBy('cases.opened_at', 'desc');
  if (filter.reviewStatus) q.whereIn('cases.review_status', filter.reviewStatus);
  if (filter.studentId) q.where('cases.student_id', filter.studentId);
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
  return { caseId, case: row, events, canals };
}
