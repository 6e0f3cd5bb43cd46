/**
 * Settings and the audit log (issue 12): the background re-judging remembers when it began,
 * so the settings page can show its progress (done of total, started, finished); and the audit
 * log gets the indexes its filters and its paging (newest first, by id) read through.
 */
import type { Knex } from 'knex';

// Outside a transaction, as in the earlier migrations: rolling back drops a column, which Knex
// does on SQLite by rebuilding the table.
export const config = { transaction: false };

export async function up(knex: Knex): Promise<void> {
  if (!(await knex.schema.hasColumn('recompute_jobs', 'started_at'))) {
    await knex.schema.alterTable('recompute_jobs', (t) => {
      // When the re-judging towards its rules and settings versions began; null on older rows.
      t.string('started_at', 30);
    });
  }
  await knex.schema.alterTable('audit_log', (t) => {
    t.index(['at'], 'audit_log_at_index');
    t.index(['actor_id', 'id'], 'audit_log_actor_id_index');
    t.index(['action', 'id'], 'audit_log_action_id_index');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('audit_log', (t) => {
    t.dropIndex(['at'], 'audit_log_at_index');
    t.dropIndex(['actor_id', 'id'], 'audit_log_actor_id_index');
    t.dropIndex(['action', 'id'], 'audit_log_action_id_index');
  });
  if (await knex.schema.hasColumn('recompute_jobs', 'started_at')) {
    await knex.schema.alterTable('recompute_jobs', (t) => {
      t.dropColumn('started_at');
    });
  }
}
