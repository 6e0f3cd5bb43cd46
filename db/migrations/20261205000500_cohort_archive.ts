/**
 * Cohorts and the director's case list (issue 12): a cohort can be archived (hidden from the
 * pickers that place students, kept with its members in every record), and the case list
 * pages through every case newest first, which an index on (opened_at, id) keeps cheap.
 */
import type { Knex } from 'knex';

// Outside a transaction, as in the earlier migrations: rolling back drops a column, which Knex
// does on SQLite by rebuilding the table, and inside a transaction that would cascade.
export const config = { transaction: false };

const CASE_ORDER_INDEX = 'cases_opened_at_id_index';

export async function up(knex: Knex): Promise<void> {
  if (!(await knex.schema.hasColumn('cohorts', 'archived_at'))) {
    await knex.schema.alterTable('cohorts', (t) => {
      // Null while the cohort is in use; when it was archived otherwise.
      t.string('archived_at', 30);
    });
  }
  await knex.raw(`create index if not exists ${CASE_ORDER_INDEX} on cases (opened_at, id)`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`drop index if exists ${CASE_ORDER_INDEX}`);
  if (await knex.schema.hasColumn('cohorts', 'archived_at')) {
    await knex.schema.alterTable('cohorts', (t) => {
      t.dropColumn('archived_at');
    });
  }
}
