/** Who may read which case: the student who owns it, their assigned attendings, directors. */
import type { Knex } from 'knex';
import type { CaseState } from '../rules/index';

export interface CaseRow {
  id: string;
  student_id: number;
  setting: 'block' | 'extracted' | 'patient';
  tooth: number | null;
  chart_ref: string | null;
  opened_at: string;
  submitted_at: string | null;
  review_status: CaseState;
  signed_off_at: string | null;
}

/** The case if `user` may read it, else undefined (callers answer 404: no hint it exists). */
export async function readableCase(k: Knex, user: SessionUser, caseId: string): Promise<CaseRow | undefined> {
  const row = await k<CaseRow>('cases').where({ id: caseId }).first();
  if (!row) return undefined;
  if (user.role === 'director') return row;
  if (user.role === 'student') return row.student_id === user.id ? row : undefined;
  const assigned = await k('assignments').where({ attending_id: user.id, student_id: row.student_id }).first();
  return assigned ? row : undefined;
}

/** A query of the cases `user` may read, for lists. */
export function readableCases(k: Knex, user: SessionUser): Knex.QueryBuilder<CaseRow, CaseRow[]> {
  const q = k<CaseRow, CaseRow[]>('cases');
  if (user.role === 'student') return q.where('cases.student_id', user.id);
  if (user.role === 'attending') {
    return q.whereIn('cases.student_id', k('assignments').select('student_id').where('attending_id', user.id));
  }
  return q;
}

export const UUID_RE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
