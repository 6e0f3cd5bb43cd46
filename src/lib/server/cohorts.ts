/**
 * Cohorts: a director creates, renames and archives them and moves students between them.
 * An archived cohort leaves the pickers that place students but stays, with its members, in
 * every record and in the case list's filter. docs/accounts.md.
 */
import type { Knex } from 'knex';
import type { CohortCreate, CohortSummary, CohortUpdate } from '../contract';
import { accountSummaries } from './accounts';
import { answer, NO_SUCH_ACCOUNT, notDirector, refuse } from './admin-answers';
import { audit } from './audit';
import type { Answer } from './request-ids';
import type { CohortRow } from './tables';

type CohortWithCount = Pick<CohortRow, 'id' | 'name' | 'graduation_year' | 'archived_at'> & {
  members: number | string;
};

/** Every cohort (or one), in use first, then by name, with its count of students. */
export async function cohortSummaries(k: Knex, id?: number): Promise<CohortSummary[]> {
  const q = k('cohorts')
    .leftJoin('users', (j) => j.on('users.cohort_id', 'cohorts.id').andOnVal('users.role', 'student'))
    .groupBy('cohorts.id', 'cohorts.name', 'cohorts.graduation_year', 'cohorts.archived_at')
    .select('cohorts.id', 'cohorts.name', 'cohorts.graduation_year', 'cohorts.archived_at')
    .count({ members: 'users.id' })
    .orderByRaw('cohorts.archived_at is not null, lower(cohorts.name)');
  if (id !== undefined) q.where('cohorts.id', id);
  const rows = (await q) as CohortWithCount[];
  return rows.map((c) => ({
    cohortId: c.id,
    name: c.name,
    graduationYear: c.graduation_year,
    archived: c.archived_at !== null,
    archivedAt: c.archived_at,
    members: Number(c.members),
  }));
}

async function cohortAnswer(k: Knex, status: number, id: number): Promise<Answer> {
  const [cohort] = await cohortSummaries(k, id);
  return answer(status, { cohort });
}

/** Another cohort already called `name` (names compare without regard to case). */
async function nameTaken(k: Knex, name: string, except?: number): Promise<boolean> {
  const q = k('cohorts').whereRaw('lower(name) = lower(?)', [name]);
  if (except !== undefined) q.whereNot('id', except);
  return (await q.first('id')) !== undefined;
}

const NAME_TAKEN = (name: string) =>
  refuse(409, `There is already a cohort called “${name}”. Choose another name.`, {
    code: 'name-taken',
    field: 'name',
  });

/** Creates a cohort (201). */
export async function createCohort(k: Knex, actor: SessionUser, input: CohortCreate): Promise<Answer> {
  const denied = notDirector(actor);
  if (denied) return denied;
  return k.transaction(async (trx) => {
    if (await nameTaken(trx, input.name)) return NAME_TAKEN(input.name);
    const [row] = await trx('cohorts')
      .insert({ name: input.name, graduation_year: input.graduationYear ?? null })
      .returning('id');
    const id = row!.id;
    await audit(trx, actor.id, 'cohort.created', 'cohort', String(id), {
      name: input.name,
      graduationYear: input.graduationYear ?? null,
    });
    return cohortAnswer(trx, 201, id);
  });
}

/** Renames a cohort, sets its class year, archives it or brings it back; each change audited. */
export async function updateCohort(
  k: Knex,
  actor: SessionUser,
  cohortId: number,
  input: CohortUpdate,
): Promise<Answer> {
  const denied = notDirector(actor);
  if (denied) return denied;
  return k.transaction(async (trx) => {
    const cohort = await trx('cohorts').where({ id: cohortId }).first();
    if (!cohort) return refuse(404, 'No such cohort.');
    const subject = String(cohort.id);
    if (input.name !== undefined && input.name !== cohort.name) {
      if (await nameTaken(trx, input.name, cohort.id)) return NAME_TAKEN(input.name);
      await trx('cohorts').where({ id: cohort.id }).update({ name: input.name });
      await audit(trx, actor.id, 'cohort.renamed', 'cohort', subject, { from: cohort.name, to: input.name });
    }
    if (input.graduationYear !== undefined && input.graduationYear !== cohort.graduation_year) {
      await trx('cohorts').where({ id: cohort.id }).update({ graduation_year: input.graduationYear });
      await audit(trx, actor.id, 'cohort.class-year-set', 'cohort', subject, {
        from: cohort.graduation_year,
        to: input.graduationYear,
      });
    }
    if (input.archived !== undefined && input.archived !== (cohort.archived_at !== null)) {
      await trx('cohorts')
        .where({ id: cohort.id })
        .update({ archived_at: input.archived ? new Date().toISOString() : null });
      await audit(trx, actor.id, input.archived ? 'cohort.archived' : 'cohort.restored', 'cohort', subject);
    }
    return cohortAnswer(trx, 200, cohort.id);
  });
}

/** Moves a student into a cohort in use, or out of every cohort (null). Already there: 200, `moved: false`. */
export async function moveStudent(
  k: Knex,
  actor: SessionUser,
  userId: number,
  cohortId: number | null,
): Promise<Answer> {
  const denied = notDirector(actor);
  if (denied) return denied;
  return k.transaction(async (trx) => {
    const user = await trx('users').where({ id: userId }).first();
    if (!user) return NO_SUCH_ACCOUNT;
    if (user.role !== 'student')
      return refuse(409, `${user.name} is not a student: only students belong to a cohort.`, {
        code: 'not-a-student',
      });
    if (cohortId !== null) {
      const cohort = await trx('cohorts').where({ id: cohortId }).first();
      if (!cohort) return refuse(404, 'cohortId names no cohort.', { field: 'cohortId' });
      if (cohort.archived_at !== null && cohort.id !== user.cohort_id)
        return refuse(409, `“${cohort.name}” is archived: bring it back before moving students into it.`, {
          code: 'archived',
          field: 'cohortId',
        });
    }
    const moved = user.cohort_id !== cohortId;
    if (moved) {
      await trx('users').where({ id: user.id }).update({ cohort_id: cohortId });
      await audit(trx, actor.id, 'user.cohort-changed', 'user', String(user.id), {
        from: user.cohort_id,
        to: cohortId,
      });
    }
    const [summary] = await accountSummaries(trx, [user.id]);
    return answer(200, { user: summary, moved });
  });
}
