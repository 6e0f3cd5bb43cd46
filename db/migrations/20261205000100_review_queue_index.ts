/**
 * The review queue (docs/review.md) looks up every cone-fit request and approval at the chair
 * in the attending's reach on each refresh (every 15 s per open queue). A partial index holds
 * only those rows, so finding them does not scan the events table, and a sync batch of
 * ordinary steps writes nothing more to it.
 */
import type { Knex } from 'knex';

// Written out rather than imported: a migration keeps the meaning it had when it ran. Literal
// SQL, as SQLite takes no parameters in an index's WHERE clause.
const CONEFIT_TYPES_SQL = "type in ('conefit.requested', 'conefit.approvedAtChair')";
const NAME = 'events_conefit_by_canal';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('events', (t) => {
    t.index(['canal_id', 'received_at'], NAME, { predicate: knex.whereRaw(CONEFIT_TYPES_SQL) });
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('events', (t) => {
    t.dropIndex(['canal_id', 'received_at'], NAME);
  });
}
