/**
 * Marks the invented demo clinic's accounts and cohort, so that a real install can tell it is
 * still in demo mode (any active demo account) and `npm run demo:remove` can take it out.
 * Cases, canals and events need no mark of their own: they belong to a demo student.
 */
import type { Knex } from 'knex';

// Outside a transaction on purpose: on SQLite, Knex drops a column by rebuilding the table and
// can switch foreign keys off for that only outside a transaction. Inside one, dropping the
// old `users` table would fire ON DELETE CASCADE / SET NULL on every table that points at it.
export const config = { transaction: false };

const TABLES = ['users', 'cohorts'] as const;

export async function up(knex: Knex): Promise<void> {
  // Each step checks first, so a run stopped half-way can simply be run again.
  for (const table of TABLES) {
    if (await knex.schema.hasColumn(table, 'demo')) continue;
    await knex.schema.alterTable(table, (t) => {
      t.boolean('demo').notNullable().defaultTo(false);
    });
  }
}

export async function down(knex: Knex): Promise<void> {
  for (const table of TABLES) {
    if (!(await knex.schema.hasColumn(table, 'demo'))) continue;
    await knex.schema.alterTable(table, (t) => {
      t.dropColumn('demo');
    });
  }
}
