/**
 * Invitations and e-mailed password resets (docs/accounts.md). Both tables exist since the
 * first migration; they gain the columns the flows need rather than being made again.
 *
 * - `invitations`: the name the director suggested, the attendings a student is to be assigned
 *   to, revocation, the account made on acceptance and how often the link was sent.
 * - `password_resets`: who asked (null: the account holder, from the sign-in page; else the
 *   director) and when a newer link replaced this one.
 * - `public_limits`: rate-limiter-flexible's counters for the public routes, kept apart from
 *   the sign-in holds (`signin_limits`) that a director lifts.
 * - `mail_outbox.recipient_id` becomes optional: an invitation goes to an address that has no
 *   account yet. SQLite cannot drop NOT NULL in place, so the table is rebuilt, rows kept.
 */
import type { Knex } from 'knex';

// Outside a transaction, as in the earlier migrations: rolling back drops columns, which Knex
// does on SQLite by rebuilding tables. The outbox rebuild runs in a transaction of its own.
export const config = { transaction: false };

/** Makes `mail_outbox` again with `recipient_id` optional (or required), keeping every row it may. */
async function rebuildOutbox(knex: Knex, recipientOptional: boolean): Promise<void> {
  await knex.transaction(async (trx) => {
    await trx.schema.createTable('mail_outbox_rebuilt', (t) => {
      t.uuid('id').primary();
      const recipient = t.integer('recipient_id').references('id').inTable('users').onDelete('CASCADE');
      if (!recipientOptional) recipient.notNullable();
      t.string('to_address', 254).notNullable();
      t.uuid('case_id').references('id').inTable('cases').onDelete('CASCADE');
      t.string('kind', 40).notNullable();
      t.string('subject', 200).notNullable();
      t.text('body_text').notNullable();
      t.string('status', 12).notNullable();
      t.integer('attempts').notNullable().defaultTo(0);
      t.string('next_attempt_at', 30).notNullable();
      t.string('claimed_until', 30);
      t.string('claim_token', 40);
      t.string('sent_at', 30);
      t.text('last_error');
      t.uuid('digest_id');
      t.string('digest_key', 80);
      t.string('created_at', 30).notNullable();
    });
    const columns = [
      'id',
      'recipient_id',
      'to_address',
      'case_id',
      'kind',
      'subject',
      'body_text',
      'status',
      'attempts',
      'next_attempt_at',
      'claimed_until',
      'claim_token',
      'sent_at',
      'last_error',
      'digest_id',
      'digest_key',
      'created_at',
    ];
    const list = columns.map((c) => `\`${c}\``).join(', ');
    // Going back, e-mail to addresses without an account (invitations) cannot be kept.
    const where = recipientOptional ? '' : ' where `recipient_id` is not null';
    await trx.raw(`insert into \`mail_outbox_rebuilt\` (${list}) select ${list} from \`mail_outbox\`${where}`);
    await trx.schema.dropTable('mail_outbox');
    await trx.schema.renameTable('mail_outbox_rebuilt', 'mail_outbox');
    await trx.schema.alterTable('mail_outbox', (t) => {
      t.unique(['digest_key'], { indexName: 'mail_outbox_digest_key_unique' });
      t.index(['status', 'next_attempt_at'], 'mail_outbox_status_next_attempt_at_index');
      t.index(['recipient_id', 'status'], 'mail_outbox_recipient_id_status_index');
    });
  });
}

export async function up(knex: Knex): Promise<void> {
  if (!(await knex.schema.hasColumn('invitations', 'revoked_at'))) {
    await knex.schema.alterTable('invitations', (t) => {
      // The name the director typed (or the CSV gave); the invitee may change it on accepting.
      t.string('name', 120);
      // A student's attendings, as a JSON list of user ids; assigned when the invitation is accepted.
      t.text('attending_ids_json');
      t.string('revoked_at', 30);
      t.integer('revoked_by').references('id').inTable('users').onDelete('SET NULL');
      t.integer('accepted_user_id').references('id').inTable('users').onDelete('SET NULL');
      // How many links were sent (a resend makes a new token; the old one no longer works).
      t.integer('sent_count').notNullable().defaultTo(1);
      t.string('last_sent_at', 30);
    });
  }
  if (!(await knex.schema.hasColumn('password_resets', 'requested_by'))) {
    await knex.schema.alterTable('password_resets', (t) => {
      // Null when the account holder asked from the sign-in page; a director's id otherwise.
      t.integer('requested_by').references('id').inTable('users').onDelete('SET NULL');
      // Set when a newer link for the same account replaced this one.
      t.string('superseded_at', 30);
      t.index(['user_id']);
    });
  }
  if (!(await knex.schema.hasTable('public_limits'))) {
    // rate-limiter-flexible's SQLite store, as `signin_limits`: its own column names and types.
    await knex.schema.createTable('public_limits', (t) => {
      t.text('key').primary();
      t.integer('points').notNullable().defaultTo(0);
      t.bigInteger('expire');
    });
  }
  const outbox = (await knex.raw("select sql from sqlite_master where type = 'table' and name = 'mail_outbox'")) as {
    sql: string;
  }[];
  if (/`recipient_id` integer not null/i.test(outbox[0]?.sql ?? '')) await rebuildOutbox(knex, true);
}

export async function down(knex: Knex): Promise<void> {
  await rebuildOutbox(knex, false);
  await knex.schema.dropTableIfExists('public_limits');
  if (await knex.schema.hasColumn('password_resets', 'requested_by')) {
    await knex.schema.alterTable('password_resets', (t) => {
      t.dropIndex(['user_id']);
      t.dropColumn('requested_by');
      t.dropColumn('superseded_at');
    });
  }
  if (await knex.schema.hasColumn('invitations', 'revoked_at')) {
    await knex.schema.alterTable('invitations', (t) => {
      for (const c of [
        'name',
        'attending_ids_json',
        'revoked_at',
        'revoked_by',
        'accepted_user_id',
        'sent_count',
        'last_sent_at',
      ])
        t.dropColumn(c);
    });
  }
}
