/**
 * The director's accounts screen: every account with its cohort, assignments and sign-in hold,
 * and the changes a director makes to an account — deactivate, re-activate, change the role,
 * lift sign-in holds. Each change is one transaction with its audit line; records stay
 * (nothing is deleted but assignment rows a role change makes meaningless). docs/accounts.md.
 */
import type { Knex } from 'knex';
import type { AccountSummary, PersonRef, Role, StudentToReassign } from '../contract';
import { answer, NO_SUCH_ACCOUNT, notDirector, refuse } from './admin-answers';
import { audit } from './audit';
import type { Answer } from './request-ids';
import { endAllSessions } from './sessions';
import { heldAccounts, liftHolds } from './signin-limits';
import type { UserRow } from './tables';

interface UserWithCohort extends Pick<UserRow, 'id' | 'name' | 'email' | 'role' | 'active' | 'cohort_id'> {
  cohort_name: string | null;
  cohort_archived_at: string | null;
}

/** Every account (or those of `ids`), by name, as the accounts screen shows them. */
export async function accountSummaries(k: Knex, ids?: number[]): Promise<AccountSummary[]> {
  const q = k('users')
    .leftJoin('cohorts', 'cohorts.id', 'users.cohort_id')
    .select(
      'users.id',
      'users.name',
      'users.email',
      'users.role',
      'users.active',
      'users.cohort_id',
      'cohorts.name as cohort_name',
      'cohorts.archived_at as cohort_archived_at',
    )
    .orderByRaw('lower(users.name), users.id');
  if (ids) q.whereIn('users.id', ids);
  const users = (await q) as UserWithCohort[];
  const people = new Map<number, PersonRef>(
    (await k('users').select('id', 'name', 'active')).map((u) => [
      u.id,
      { userId: u.id, name: u.name, active: Boolean(u.active) },
    ]),
  );
  const pairs = await k('assignments').select('attending_id', 'student_id');
  const held = await heldAccounts(k);
  const byName = (a: PersonRef, b: PersonRef) => a.name.localeCompare(b.name);
  return users.map((u) => {
    const until = held.get(u.email);
    return {
      userId: u.id,
      name: u.name,
      email: u.email,
      role: u.role,
      active: Boolean(u.active),
      cohort:
        u.cohort_id === null
          ? null
          : { cohortId: u.cohort_id, name: u.cohort_name ?? '', archived: u.cohort_archived_at !== null },
      attendings:
        u.role === 'student'
          ? pairs
              .filter((p) => p.student_id === u.id)
              .map((p) => people.get(p.attending_id)!)
              .sort(byName)
          : [],
      students:
        u.role === 'attending'
          ? pairs
              .filter((p) => p.attending_id === u.id)
              .map((p) => people.get(p.student_id)!)
              .sort(byName)
          : [],
      heldUntil: until === undefined ? null : new Date(until).toISOString(),
    };
  });
}

async function summaryOf(k: Knex, userId: number): Promise<AccountSummary> {
  const [s] = await accountSummaries(k, [userId]);
  if (!s) throw new Error(`account ${userId} vanished inside its own transaction`);
  return s;
}

/**
 * The active students assigned to `attendingId`, each with their other active attendings: who
 * needs another attending once this one is deactivated or stops being one.
 */
export async function studentsOf(k: Knex, attendingId: number): Promise<StudentToReassign[]> {
  const students = await k('assignments')
    .join('users', 'users.id', 'assignments.student_id')
    .where('assignments.attending_id', attendingId)
    .where('users.active', true)
    .select('users.id', 'users.name')
    .orderByRaw('lower(users.name)');
  if (students.length === 0) return [];
  const others = await k('assignments')
    .join('users', 'users.id', 'assignments.attending_id')
    .whereIn(
      'assignments.student_id',
      students.map((s) => s.id),
    )
    .whereNot('assignments.attending_id', attendingId)
    .where('users.active', true)
    .select('assignments.student_id', 'users.id', 'users.name')
    .orderByRaw('lower(users.name)');
  return students.map((s) => ({
    userId: s.id,
    name: s.name,
    otherAttendings: others
      .filter((o) => o.student_id === s.id)
      .map((o) => ({ userId: o.id, name: o.name, active: true })),
  }));
}

async function otherActiveDirectors(k: Knex, userId: number): Promise<number> {
  const [row] = await k('users')
    .where({ role: 'director', active: true })
    .whereNot('id', userId)
    .count<{ n: number | string }[]>({ n: '*' });
  return Number(row?.n ?? 0);
}

const LAST_DIRECTOR = (what: string) =>
  refuse(
    409,
    `This is the last active director: ${what} would leave nobody to run the school. Make another director first.`,
    {
      code: 'last-director',
    },
  );

/** Deactivates an account: it can no longer sign in and every session of it ends at once. */
export async function deactivate(k: Knex, actor: SessionUser, userId: number): Promise<Answer> {
  const denied = notDirector(actor);
  if (denied) return denied;
  return k.transaction(async (trx) => {
    const user = await trx('users').where({ id: userId }).first();
    if (!user) return NO_SUCH_ACCOUNT;
    if (user.id === actor.id)
      return refuse(409, 'You cannot deactivate your own account; another director can.', { code: 'self' });
    if (!user.active) return refuse(409, `${user.name} is already deactivated.`, { code: 'unchanged' });
    if (user.role === 'director' && (await otherActiveDirectors(trx, user.id)) === 0)
      return LAST_DIRECTOR('deactivating it');
    await trx('users').where({ id: user.id }).update({ active: false });
    const sessionsEnded = await endAllSessions(trx, user.id, 'deactivated');
    // The assignments stay (records stay, and a re-activation brings them back); the students
    // are named so that the director can give them another attending now.
    const studentsToReassign = user.role === 'attending' ? await studentsOf(trx, user.id) : [];
    await audit(trx, actor.id, 'user.deactivated', 'user', String(user.id), {
      role: user.role,
      sessionsEnded,
      students: studentsToReassign.map((s) => s.userId),
    });
    return answer(200, { user: await summaryOf(trx, user.id), sessionsEnded, studentsToReassign });
  });
}

/** Re-activates an account. No session of it comes back: the person signs in again. */
export async function reactivate(k: Knex, actor: SessionUser, userId: number): Promise<Answer> {
  const denied = notDirector(actor);
  if (denied) return denied;
  return k.transaction(async (trx) => {
    const user = await trx('users').where({ id: userId }).first();
    if (!user) return NO_SUCH_ACCOUNT;
    if (user.active) return refuse(409, `${user.name} is already active.`, { code: 'unchanged' });
    await trx('users').where({ id: user.id }).update({ active: true });
    const sessionsEnded = await endAllSessions(trx, user.id, 'reactivated');
    await audit(trx, actor.id, 'user.reactivated', 'user', String(user.id), { role: user.role });
    return answer(200, { user: await summaryOf(trx, user.id), sessionsEnded, studentsToReassign: [] });
  });
}

/**
 * Changes an account's role. What goes with the old role: a student's assignments (and their
 * cohort), or an attending's assignments, whose students are named for another attending.
 * Cases, sign-offs and comments stay as they are. Every session of the account ends, so no
 * page or tablet goes on under the old role.
 */
export async function changeRole(k: Knex, actor: SessionUser, userId: number, role: Role): Promise<Answer> {
  const denied = notDirector(actor);
  if (denied) return denied;
  return k.transaction(async (trx) => {
    const user = await trx('users').where({ id: userId }).first();
    if (!user) return NO_SUCH_ACCOUNT;
    if (user.id === actor.id)
      return refuse(409, 'You cannot change your own role; another director can.', { code: 'self', field: 'role' });
    if (user.role === role)
      return refuse(409, `${user.name} is already in that role.`, { code: 'unchanged', field: 'role' });
    if (user.role === 'director' && user.active && (await otherActiveDirectors(trx, user.id)) === 0)
      return LAST_DIRECTOR('changing its role');
    const studentsToReassign = user.role === 'attending' ? await studentsOf(trx, user.id) : [];
    const column = user.role === 'student' ? 'student_id' : user.role === 'attending' ? 'attending_id' : null;
    const removed = column
      ? await trx('assignments')
          .where(column, user.id)
          .select('attending_id', 'student_id')
          .orderBy(['attending_id', 'student_id'])
      : [];
    if (column) await trx('assignments').where(column, user.id).delete();
    // A cohort is a class of students: leaving the student role leaves the cohort.
    const cohortLeft = user.role === 'student' ? user.cohort_id : null;
    await trx('users')
      .where({ id: user.id })
      .update({ role, ...(user.role === 'student' ? { cohort_id: null } : {}) });
    const sessionsEnded = await endAllSessions(trx, user.id, 'role-changed');
    const assignmentsRemoved = removed.map((r) => ({ attendingId: r.attending_id, studentId: r.student_id }));
    await audit(trx, actor.id, 'user.role-changed', 'user', String(user.id), {
      from: user.role,
      to: role,
      sessionsEnded,
      assignmentsRemoved,
      ...(cohortLeft !== null ? { cohortLeft } : {}),
    });
    return answer(200, {
      user: await summaryOf(trx, user.id),
      from: user.role,
      sessionsEnded,
      assignmentsRemoved,
      studentsToReassign,
    });
  });
}

/** Lifts every sign-in hold on the account (from any address); the next right password lets it in. */
export async function liftAccountHolds(k: Knex, actor: SessionUser, userId: number): Promise<Answer> {
  const denied = notDirector(actor);
  if (denied) return denied;
  return k.transaction(async (trx) => {
    const user = await trx('users').where({ id: userId }).first();
    if (!user) return NO_SUCH_ACCOUNT;
    const holdsLifted = await liftHolds(trx, user.email);
    await audit(trx, actor.id, 'user.holds-lifted', 'user', String(user.id), { holdsLifted });
    return answer(200, { user: await summaryOf(trx, user.id), holdsLifted });
  });
}
