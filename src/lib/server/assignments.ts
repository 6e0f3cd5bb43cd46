/**
 * Assignments: which attendings review which student. A row (attending, student) lets the
 * attending read the student's cases, sign them off and be told of submissions (access.ts,
 * reviews.ts, mail-notices.ts). A director sets a student's attendings as a whole set.
 * docs/accounts.md.
 */
import type { Knex } from 'knex';
import type { PersonRef } from '../contract';
import { answer, NO_SUCH_ACCOUNT, notDirector, refuse } from './admin-answers';
import { audit } from './audit';
import type { Answer } from './request-ids';

/** The student's attendings, by name (deactivated ones included, marked). */
export async function attendingsOf(k: Knex, studentId: number): Promise<PersonRef[]> {
  const rows = await k('assignments')
    .join('users', 'users.id', 'assignments.attending_id')
    .where('assignments.student_id', studentId)
    .select('users.id', 'users.name', 'users.active')
    .orderByRaw('lower(users.name)');
  return rows.map((r) => ({ userId: r.id, name: r.name, active: Boolean(r.active) }));
}

/** GET /api/users/{studentId}/assignments: 404 for an account that is not a student's. */
export async function studentAssignments(k: Knex, actor: SessionUser, studentId: number): Promise<Answer> {
  const denied = notDirector(actor);
  if (denied) return denied;
  const user = await k('users').where({ id: studentId }).first('role');
  if (!user) return NO_SUCH_ACCOUNT;
  if (user.role !== 'student') return refuse(409, 'Only students have attendings.', { code: 'not-a-student' });
  return answer(200, { studentId, attendings: await attendingsOf(k, studentId) });
}

/**
 * Sets the student's attendings to exactly `attendingIds`. Each must be an attending; one
 * newly added must be active (a deactivated attending already assigned may stay, as records
 * do). Nothing changed: 200 with nothing added or removed, and no audit line.
 */
export async function setAssignments(
  k: Knex,
  actor: SessionUser,
  studentId: number,
  attendingIds: number[],
): Promise<Answer> {
  const denied = notDirector(actor);
  if (denied) return denied;
  return k.transaction(async (trx) => {
    const student = await trx('users').where({ id: studentId }).first();
    if (!student) return NO_SUCH_ACCOUNT;
    if (student.role !== 'student')
      return refuse(409, `${student.name} is not a student: only students are assigned attendings.`, {
        code: 'not-a-student',
      });
    const current = new Set(await trx('assignments').where({ student_id: studentId }).pluck('attending_id'));
    const named = attendingIds.length
      ? await trx('users').whereIn('id', attendingIds).select('id', 'name', 'role', 'active')
      : [];
    for (const id of attendingIds) {
      const u = named.find((n) => n.id === id);
      if (!u) return refuse(404, `attendingIds names ${id}, which is no account.`, { field: 'attendingIds' });
      if (u.role !== 'attending')
        return refuse(400, `attendingIds names ${u.name}, who is not an attending.`, { field: 'attendingIds' });
      if (!u.active && !current.has(id))
        return refuse(409, `${u.name} is deactivated: choose an active attending.`, {
          code: 'inactive',
          field: 'attendingIds',
        });
    }
    const wanted = new Set(attendingIds);
    const added = attendingIds.filter((id) => !current.has(id)).sort((a, b) => a - b);
    const removed = [...current].filter((id) => !wanted.has(id)).sort((a, b) => a - b);
    if (removed.length)
      await trx('assignments').where({ student_id: studentId }).whereIn('attending_id', removed).delete();
    if (added.length)
      await trx('assignments').insert(added.map((attending_id) => ({ attending_id, student_id: studentId })));
    if (added.length || removed.length)
      await audit(trx, actor.id, 'assignments.changed', 'user', String(studentId), { added, removed });
    return answer(200, { studentId, attendings: await attendingsOf(trx, studentId), added, removed });
  });
}
