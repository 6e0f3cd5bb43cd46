/**
 * What GET /api/me tells the tablet besides who is signed in: a student's assigned attendings
 * (kept on the tablet to record an approval at the chair offline) and whether the course asks
 * for the attending's approval of each cone fit before sealing (docs/review.md).
 */
import type { Knex } from 'knex';
import type { AttendingRef } from '../contract';
import { readSettings } from './settings';

/** A student's active assigned attendings, by name; none for other roles. */
export async function attendingsOf(k: Knex, user: Pick<SessionUser, 'id' | 'role'>): Promise<AttendingRef[]> {
  if (user.role !== 'student') return [];
  return (await k('assignments')
    .join('users', 'users.id', 'assignments.attending_id')
    .where('assignments.student_id', user.id)
    .where('users.active', true)
    .select('users.id', 'users.name')
    .orderBy('users.name')) as AttendingRef[];
}

/** The chairside's part of GET /api/me. */
export async function chairsideFacts(
  k: Knex,
  user: Pick<SessionUser, 'id' | 'role'>,
): Promise<{ attendings: AttendingRef[]; requireConeFitApproval: boolean }> {
  const { values } = await readSettings(k);
  return { attendings: await attendingsOf(k, user), requireConeFitApproval: values.requireConeFitApproval >= 1 };
}
