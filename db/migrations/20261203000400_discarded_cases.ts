/**
 * A case opened by mistake can be discarded (`case.discarded`, contract version 2): it leaves
 * every list, and voiding the discard brings it back. The lifecycle's `discarded` state is
 * kept in its own column rather than in `review_status`, whose CHECK constraint SQLite could
 * only widen by rebuilding the table; the review state underneath is kept for a restore.
 */
import type { Knex } from 'knex';

// Outside a transaction, as in the earlier migrations: rolling back drops the column, which
// Knex does on SQLite by rebuilding the table, and inside a transaction that would cascade.
export const config = { transaction: false };

export async function up(knex: Knex): Promise<void> {
  if (await knex.schema.hasColumn('cases', 'discarded_at')) return;
  await knex.schema.alterTable('cases', (t) => {
    // Null while the case is not discarded; the instant of the standing `case.discarded` else.
    t.string('discarded_at', 30);
  });
}

export async function down(knex: Knex): Promise<void> {
  if (!(await knex.schema.hasColumn('cases', 'discarded_at'))) return;
  await knex.schema.alterTable('cases', (t) => {
    t.dropColumn('discarded_at');
  });
}
