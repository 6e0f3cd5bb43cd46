/**
 * The invented demo clinic in a real database: whether it is still there, and taking it out.
 * Demo accounts and cohorts carry `demo = true` (set by the demo seed); cases, canals and
 * events are demo data because a demo student owns them.
 */
import type { Knex } from 'knex';
import { audit } from './audit';

/** Active demo accounts: while there is one, the installation is in demo mode. */
export async function activeDemoAccounts(k: Knex): Promise<number> {
  const row = (await k('users').where({ demo: true, active: true }).count({ n: '*' }).first()) as
    { n: number | string } | undefined;
  return Number(row?.n ?? 0);
}

/** What one removal took out, by what it is (numbers of rows). */
export interface DemoRemoval {
  accounts: number;
  cohorts: number;
  cases: number;
  canals: number;
  events: number;
  findings: number;
  radiographs: number;
  signoffs: number;
  comments: number;
  assignments: number;
  sessions: number;
  invitations: number;
  /** Audit lines that named a demo account as actor: kept, with no actor. */
  auditLinesKept: number;
}

/** Removing the demo would also delete records of real people: nothing was removed. */
export class DemoRemovalBlocked extends Error {
  constructor(readonly reasons: string[]) {
    super(`the demo clinic is tied to real records: ${reasons.join('; ')}`);
  }
}

/**
 * Removes every demo account and all that belongs to it, in one transaction: their cases
 * (with canals, events, findings, radiographs, sign-offs and comments), assignments,
 * sessions, password resets, request ids and the invitations they sent, then each demo
 * cohort no remaining account belongs to. Audit lines stay, with no actor. Refuses, removing
 * nothing, when a demo account wrote into a real student's case (a sign-off, a comment, a
 * radiograph, an event): deleting those would change a real record.
 * Running it again finds nothing and removes nothing.
 */
export async function removeDemo(k: Knex): Promise<DemoRemoval> {
  return k.transaction(async (trx) => {
    const demoUsers = () => trx('users').select('id').where({ demo: true });
    const demoCases = () => trx('cases').select('id').whereIn('student_id', demoUsers());

    const reasons: string[] = [];
    const foreign = [
      ['signoffs', 'attending_id', 'sign-off'],
      ['comments', 'author_id', 'comment'],
      ['radiographs', 'uploaded_by', 'radiograph'],
      ['events', 'user_id', 'recorded event'],
    ] as const;
    for (const [table, column, what] of foreign) {
      const n = await count(trx(table).whereIn(column, demoUsers()).whereNotIn('case_id', demoCases()));
      if (n > 0) reasons.push(`${n} ${what}${n === 1 ? '' : 's'} by a demo account in real students' cases`);
    }
    if (reasons.length > 0) throw new DemoRemovalBlocked(reasons);

    // Children first, so each count is exact whether or not the database cascades.
    const byCase = (table: string) => trx(table).whereIn('case_id', demoCases()).del();
    // E-mail to or about demo accounts is no real clinic's mail.
    await trx('mail_outbox').whereIn('recipient_id', demoUsers()).orWhereIn('case_id', demoCases()).del();
    const findings = await byCase('findings');
    const radiographs = await byCase('radiographs');
    const signoffs = await byCase('signoffs');
    const comments = await byCase('comments');
    const events = await byCase('events');
    const canals = await byCase('canals');
    const cases = await trx('cases').whereIn('student_id', demoUsers()).del();
    const assignments = await trx('assignments')
      .whereIn('attending_id', demoUsers())
      .orWhereIn('student_id', demoUsers())
      .del();
    const sessions = await trx('sessions').whereIn('user_id', demoUsers()).del();
    await trx('password_resets').whereIn('user_id', demoUsers()).del();
    await trx('request_ids').whereIn('user_id', demoUsers()).del();
    // An invitation sent from a demo account is no invitation a real clinic made.
    const invitations = await trx('invitations').whereIn('invited_by', demoUsers()).del();
    await trx('settings').whereIn('updated_by', demoUsers()).update({ updated_by: null });
    const auditLinesKept = await trx('audit_log').whereIn('actor_id', demoUsers()).update({ actor_id: null });
    const accounts = await trx('users').where({ demo: true }).del();
    const cohorts = await trx('cohorts')
      .where({ demo: true })
      .whereNotIn('id', trx('users').select('cohort_id').whereNotNull('cohort_id'))
      .del();

    const removed: DemoRemoval = {
      accounts,
      cohorts,
      cases,
      canals,
      events,
      findings,
      radiographs,
      signoffs,
      comments,
      assignments,
      sessions,
      invitations,
      auditLinesKept,
    };
    if (accounts + cohorts > 0) await audit(trx, null, 'demo.removed', null, null, { ...removed });
    return removed;
  });
}

async function count(q: Knex.QueryBuilder): Promise<number> {
  const row = (await q.count({ n: '*' }).first()) as { n: number | string } | undefined;
  return Number(row?.n ?? 0);
}
