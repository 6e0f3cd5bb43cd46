/** Who may read which case: the student who owns it, their assigned attendings, directors. */
import type { Knex } from 'knex';

import type { CaseRow } from './tables';

export type { CaseRow };

/** The case if `user` may read it, else undefined (callers answer 404: no hint it exists). */
export async function readableCase(k: Knex, user: SessionUser, caseId: string): Promise<CaseRow | undefined> {
  const row = await k('cases').where({ id: caseId }).first();
  if (!row) return undefined;
  if (user.role === 'director') return row;
  if (user.role === 'student') return row.student_id === user.id ? row : undefined;
  const assigned = await k('assignments').where({ attending_id: user.id, student_id: row.student_id }).first();
  return assigned ? row : undefined;
}

/** A query of the cases `user` may read, for lists. */
export function readableCases(k: Knex, user: SessionUser): Knex.QueryBuilder<CaseRow, CaseRow[]> {
  const q = k('cases');
  if (user.role === 'student') return q.where('cases.student_id', user.id);
  if (user.role === 'attending') {
    return q.whereIn('cases.student_id', k('assignments').select('student_id').where('attending_id', user.id));
  }
  return q;
}

export const UUID_RE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
