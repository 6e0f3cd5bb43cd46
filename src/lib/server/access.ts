/** Who may read which case: the student who owns it, their assigned attendings, directors. */
import type { Knex } from 'knex';
import { withStatements } from './prepared';

import type { CaseRow } from './tables';

export type { CaseRow };

const CASE = 'select * from cases where id = ? limit 1';
const ASSIGNED = 'select 1 from assignments where attending_id = ? and student_id = ? limit 1';

/**
 * The case if `user` may read it, else undefined (callers answer 404: no hint it exists).
 * Checked on every canal and case read, so prepared statements rather than Knex queries.
 */
export function readableCase(k: Knex, user: SessionUser, caseId: string): Promise<CaseRow | undefined> {
  return withStatements(k, (prepare) => {
    const row = prepare(CASE).get(caseId) as CaseRow | undefined;
    if (!row) return undefined;
    if (user.role === 'director') return row;
    if (user.role === 'student') return row.student_id === user.id ? row : undefined;
    return prepare(ASSIGNED).get(user.id, row.student_id) ? row : undefined;
  });
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
