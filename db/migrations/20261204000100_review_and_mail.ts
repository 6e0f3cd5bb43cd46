/**
 * Review and mail (issue 11): sign-offs and comments carry the id the client made (the same id
 * again is the same sign-off), a final approval can be superseded by a reopening, an attending
 * may take a daily digest instead of one e-mail each, and e-mail goes through an outbox
 * written in the transaction of its cause (src/lib/server/mail-outbox.ts).
 *
 * `signoffs` and `comments` exist since the first migration (the demo seed writes sign-offs);
 * they gain columns rather than being made again, so no row is lost.
 */
import type { Knex } from 'knex';

// Outside a transaction, as in the earlier migrations: rolling back drops columns, which Knex
// does on SQLite by rebuilding the table, and inside a transaction that would cascade.
export const config = { transaction: false };

export async function up(knex: Knex): Promise<void> {
  if (!(await knex.schema.hasColumn('signoffs', 'client_id'))) {
    await knex.schema.alterTable('signoffs', (t) => {
      // The request's client-made id; null on rows written before it (the demo's).
      t.uuid('client_id');
      // Set on a final approval when the case is reopened, naming the reopening sign-off.
      t.string('superseded_at', 30);
      t.integer('superseded_by');
      t.unique(['client_id']);
    });
  }
  if (!(await knex.schema.hasColumn('comments', 'client_id'))) {
    await knex.schema.alterTable('comments', (t) => {
      t.uuid('client_id');
      t.unique(['client_id']);
    });
  }
  if (!(await knex.schema.hasColumn('users', 'mail_digest'))) {
    await knex.schema.alterTable('users', (t) => {
      // 1: review notices wait for one e-mail a day; 0: one e-mail each (the default).
      t.boolean('mail_digest').notNullable().defaultTo(false);
    });
  }
  if (!(await knex.schema.hasTable('mail_outbox'))) {
    await knex.schema.createTable('mail_outbox', (t) => {
      // A UUID: the e-mail's Message-ID is made from it, so a resend after a crash is the same message.
      t.uuid('id').primary();
      t.integer('recipient_id').notNullable().references('id').inTable('users').onDelete('CASCADE');
      t.string('to_address', 254).notNullable();
      t.uuid('case_id').references('id').inTable('cases').onDelete('CASCADE');
      t.string('kind', 40).notNullable();
      t.string('subject', 200).notNullable();
      t.text('body_text').notNullable();
      // held (waits for the digest), pending, sent, digested (went out inside a digest).
      t.string('status', 12).notNullable();
      t.integer('attempts').notNullable().defaultTo(0);
      t.string('next_attempt_at', 30).notNullable();
      // A worker owns the row until then; after it, a crashed worker's claim has lapsed.
      t.string('claimed_until', 30);
      t.string('claim_token', 40);
      t.string('sent_at', 30);
      t.text('last_error');
      t.uuid('digest_id');
      // recipient:day for a digest, so one recipient gets at most one digest a day.
      t.string('digest_key', 80).unique();
      t.string('created_at', 30).notNullable();
      t.index(['status', 'next_attempt_at']);
      t.index(['recipient_id', 'status']);
    });
  }
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('mail_outbox');
  if (await knex.schema.hasColumn('users', 'mail_digest'))
    await knex.schema.alterTable('users', (t) => t.dropColumn('mail_digest'));
  if (await knex.schema.hasColumn('comments', 'client_id'))
    await knex.schema.alterTable('comments', (t) => {
      t.dropUnique(['client_id']);
      t.dropColumn('client_id');
    });
  if (await knex.schema.hasColumn('signoffs', 'client_id'))
    await knex.schema.alterTable('signoffs', (t) => {
      t.dropUnique(['client_id']);
      t.dropColumn('client_id');
      t.dropColumn('superseded_at');
      t.dropColumn('superseded_by');
    });
}
