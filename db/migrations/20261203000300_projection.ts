/**
 * What the projection (src/lib/server/projection.ts) keeps beside the derived rows: the rules
 * and settings versions that judged each canal, the history of every finding (raised, then
 * cleared), the settings version, and the cursor of the background re-judging. Portable
 * Knex schema only, like the first migration.
 */
import type { Knex } from 'knex';

// Outside a transaction, as in the demo-marker migration: on SQLite, Knex drops a column by
// rebuilding the table, and only outside a transaction can it switch foreign keys off for
// that; inside one, dropping the old `canals` would cascade to its findings. Each step checks
// first, so a run stopped half-way can simply be run again.
export const config = { transaction: false };

export async function up(knex: Knex): Promise<void> {
  if (!(await knex.schema.hasColumn('canals', 'rules_version'))) {
    await knex.schema.alterTable('canals', (t) => {
      // Null until the canal is judged by a projection that records them.
      t.integer('rules_version');
      t.integer('settings_version');
    });
  }
  if (await knex.schema.hasTable('recompute_jobs')) return;
  await knex.transaction((trx) => createTables(trx));
}

async function createTables(knex: Knex): Promise<void> {
  await knex.schema.createTable('finding_history', (t) => {
    t.increments('id').primary();
    t.uuid('canal_id').notNullable().references('id').inTable('canals').onDelete('CASCADE');
    t.string('code', 60).notNullable();
    t.uuid('event_id');
    t.string('first_raised_at', 30).notNullable();
    // Null while the finding is open.
    t.string('cleared_at', 30);
    t.index(['canal_id', 'cleared_at']);
    t.index(['code']);
  });

  // One row: the settings version, raised by every change of a setting.
  await knex.schema.createTable('settings_version', (t) => {
    t.integer('id').primary();
    t.integer('version').notNullable();
  });
  await knex('settings_version').insert({ id: 1, version: 1 });

  // The background re-judging of unlocked canals: what it is bringing them to, and how far it got.
  await knex.schema.createTable('recompute_jobs', (t) => {
    t.string('name', 40).primary();
    t.integer('rules_version').notNullable();
    t.integer('settings_version').notNullable();
    // The last canal id done (canals are taken in id order); null before the first.
    t.uuid('cursor');
    t.string('finished_at', 30);
    t.string('updated_at', 30).notNullable();
  });

  // The findings open today become open history rows, raised when their canal was last judged.
  const now = new Date().toISOString();
  const open = (await knex('findings').select('canal_id', 'code', 'event_id').orderBy('id')) as {
    canal_id: string;
    code: string;
    event_id: string | null;
  }[];
  const rows = open.map((f) => ({ ...f, first_raised_at: now, cleared_at: null }));
  for (let i = 0; i < rows.length; i += 100) await knex('finding_history').insert(rows.slice(i, i + 100));

  // The typed settings store keeps one row per named number; the old object row is split up.
  const old = (await knex('settings').where({ key: 'tolerances' }).first()) as
    { value_json: string; updated_by: number | null } | undefined;
  if (old) {
    let values: Record<string, unknown> = {};
    try {
      values = JSON.parse(old.value_json) as Record<string, unknown>;
    } catch {
      // An unreadable row held nothing usable; the defaults stand.
    }
    for (const [key, value] of Object.entries(values)) {
      if (typeof value !== 'number') continue;
      await knex('settings')
        .insert({ key, value_json: JSON.stringify(value), updated_by: old.updated_by })
        .onConflict('key')
        .merge();
    }
    await knex('settings').where({ key: 'tolerances' }).delete();
  }
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('recompute_jobs');
  await knex.schema.dropTableIfExists('settings_version');
  await knex.schema.dropTableIfExists('finding_history');
  if (await knex.schema.hasColumn('canals', 'rules_version')) {
    await knex.schema.alterTable('canals', (t) => {
      t.dropColumn('settings_version');
      t.dropColumn('rules_version');
    });
  }
}
