/**
 * Demo data: the invented Larkfield teaching clinic. Replaces whatever is in the database,
 * so run it on an empty or throw-away one (`npm start` seeds only an empty database).
 * Its accounts and cohort are marked `demo`: while one of them is active the installation is
 * in demo mode, and `npm run demo:remove` takes all of it out again.
 */
import type { Knex } from 'knex';
import { ASSIGNMENTS, COHORT, DEMO_PASSWORD, PEOPLE, demoCases } from '../demo/clinic';
import { hashPassword } from '../../src/lib/server/users';
import { ingestBatch } from '../../src/lib/server/sync';
import { reviewCase } from '../../src/lib/server/projection';

const TABLES = [
  'mail_outbox',
  'audit_log',
  'recompute_jobs',
  'settings',
  'password_resets',
  'invitations',
  'comments',
  'signoffs',
  'radiographs',
  'findings',
  'events',
  'canals',
  'cases',
  'assignments',
  'users',
  'cohorts',
];

export async function seed(knex: Knex): Promise<void> {
  for (const t of TABLES) await knex(t).del();

  const [cohort] = await knex('cohorts')
    .insert({ ...COHORT, demo: true })
    .returning('id');
  const cohortId = cohort!.id;
  const password_hash = await hashPassword(DEMO_PASSWORD);
  const ids = new Map<string, number>();
  for (const p of PEOPLE) {
    const [row] = await knex('users')
      .insert({
        email: p.email,
        name: p.name,
        role: p.role,
        password_hash,
        demo: true,
        cohort_id: p.role === 'student' ? cohortId : null,
      })
      .returning('id');
    ids.set(p.key, row!.id);
  }
  await knex('assignments').insert(ASSIGNMENTS.map(([a, s]) => ({ attending_id: ids.get(a), student_id: ids.get(s) })));

  for (const c of demoCases()) {
    const studentId = ids.get(c.student)!;
    const answer = await ingestBatch(knex, studentId, 'demo-seed', c.script.events, new Date('2026-12-01T00:00:00Z'));
    const rejected = answer.results.filter((r) => r.status === 'rejected');
    if (rejected.length > 0)
      throw new Error(`demo case ${c.script.caseId} has rejected events: ${JSON.stringify(rejected)}`);
    if (c.review) {
      const at = new Date(Date.parse(c.script.events.at(-1)!.at) + 86_400_000).toISOString();
      await knex('signoffs').insert({
        case_id: c.script.caseId,
        checkpoint: 'final',
        decision: c.review.decision,
        rubric_json: JSON.stringify({ length: c.review.decision === 'approved' ? 'meets' : 'below', density: 'meets' }),
        comment: c.review.comment,
        attending_id: ids.get(c.review.by),
        created_at: at,
      });
      await reviewCase(knex, c.script.caseId, c.review.decision === 'approved' ? 'approve' : 'return', at);
    }
  }
  // The demo's submissions are back-dated history: nobody is to be e-mailed about them.
  await knex('mail_outbox').del();
}
