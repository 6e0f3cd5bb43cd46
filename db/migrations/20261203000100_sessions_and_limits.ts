/**
 * Sessions kept on the server (a JWT alone cannot be ended), the sign-in limiter's counters,
 * and the answers to state-changing requests by their client-made id.
 */
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('sessions', (t) => {
    // Random, carried in the session token; never derived from anything guessable.
    t.string('id', 64).primary();
    t.integer('user_id').notNullable().references('id').inTable('users').onDelete('CASCADE');
    t.string('created_at', 30).notNullable();
    t.string('expires_at', 30).notNullable();
    // Set when the session is ended (sign-out, sign-out everywhere, deactivation, reset).
    t.string('ended_at', 30);
    t.string('ended_by', 30);
    t.index(['user_id']);
  });

  // rate-limiter-flexible's SQLite store: its own column names and types (points consumed,
  // expiry in epoch milliseconds). Made here so that the limiter never issues DDL.
  await knex.schema.createTable('signin_limits', (t) => {
    t.text('key').primary();
    t.integer('points').notNullable().defaultTo(0);
    t.bigInteger('expire');
  });

  await knex.schema.createTable('request_ids', (t) => {
    t.string('id', 64).notNullable();
    t.integer('user_id').notNullable().references('id').inTable('users').onDelete('CASCADE');
    t.string('route', 80).notNullable();
    // A hash of the normalised body: the same id with another body is a conflict.
    t.string('body_hash', 64).notNullable();
    t.integer('status').notNullable();
    t.text('answer_json').notNullable();
    t.string('at', 30).notNullable();
    t.primary(['user_id', 'id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('request_ids');
  await knex.schema.dropTable('signin_limits');
  await knex.schema.dropTable('sessions');
}
