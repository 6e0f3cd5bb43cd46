/**
 * Coneline's whole domain. Portable Knex schema only (no SQLite-only SQL), so the same
 * migration can run on PostgreSQL when a school outgrows one server.
 */
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('cohorts', (t) => {
    t.increments('id').primary();
    t.string('name', 120).notNullable().unique();
    t.integer('graduation_year');
    t.timestamp('created_at').notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable('users', (t) => {
    t.increments('id').primary();
    t.string('email', 254).notNullable().unique();
    t.string('name', 120).notNullable();
    t.enu('role', ['student', 'attending', 'director']).notNullable();
    t.boolean('active').notNullable().defaultTo(true);
    t.string('password_hash', 255);
    // Bumped on sign-out and deactivation: a JWT carrying an older value is refused.
    t.integer('session_version').notNullable().defaultTo(1);
    t.integer('cohort_id').references('id').inTable('cohorts').onDelete('SET NULL');
    t.timestamp('created_at').notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable('assignments', (t) => {
    t.integer('attending_id').notNullable().references('id').inTable('users').onDelete('CASCADE');
    t.integer('student_id').notNullable().references('id').inTable('users').onDelete('CASCADE');
    t.timestamp('created_at').notNullable().defaultTo(knex.fn.now());
    t.primary(['attending_id', 'student_id']);
    t.index(['student_id']);
  });

  await knex.schema.createTable('cases', (t) => {
    t.uuid('id').primary();
    t.integer('student_id').notNullable().references('id').inTable('users');
    t.enu('setting', ['block', 'extracted', 'patient']).notNullable();
    t.integer('tooth');
    t.string('chart_ref', 64);
    t.string('opened_at', 30).notNullable();
    t.string('submitted_at', 30);
    // open → submitted → approved | returned (a returned case may be submitted again).
    t.enu('review_status', ['open', 'submitted', 'approved', 'returned']).notNullable().defaultTo('open');
    t.string('signed_off_at', 30);
    t.timestamp('updated_at').notNullable().defaultTo(knex.fn.now());
    t.index(['student_id', 'opened_at']);
    t.index(['review_status']);
  });

  await knex.schema.createTable('canals', (t) => {
    t.uuid('id').primary();
    t.uuid('case_id').notNullable().references('id').inTable('cases').onDelete('CASCADE');
    t.string('name', 12).notNullable();
    t.string('status', 20).notNullable();
    // Derived by the rules core after every batch that touches the canal, so reads are cheap.
    t.text('state_json').notNullable();
    t.integer('stops').notNullable().defaultTo(0);
    t.integer('cautions').notNullable().defaultTo(0);
    t.integer('notes').notNullable().defaultTo(0);
    t.timestamp('updated_at').notNullable().defaultTo(knex.fn.now());
    t.index(['case_id']);
  });

  await knex.schema.createTable('events', (t) => {
    t.uuid('id').primary();
    t.uuid('case_id').notNullable().references('id').inTable('cases').onDelete('CASCADE');
    t.uuid('canal_id');
    t.string('type', 40).notNullable();
    t.string('at', 30).notNullable();
    t.text('data_json').notNullable();
    // The normalised event as stable JSON: a re-send is a duplicate only if this matches.
    t.text('canonical').notNullable();
    t.integer('user_id').notNullable().references('id').inTable('users');
    t.string('device_id', 80).notNullable();
    t.string('received_at', 30).notNullable();
    t.index(['case_id', 'at']);
    t.index(['canal_id']);
  });

  await knex.schema.createTable('findings', (t) => {
    t.increments('id').primary();
    t.uuid('canal_id').notNullable().references('id').inTable('canals').onDelete('CASCADE');
    t.uuid('case_id').notNullable().references('id').inTable('cases').onDelete('CASCADE');
    t.string('code', 60).notNullable();
    t.enu('severity', ['stop', 'caution', 'note']).notNullable();
    t.uuid('event_id');
    t.text('message').notNullable();
    t.index(['canal_id']);
    t.index(['code']);
  });

  await knex.schema.createTable('radiographs', (t) => {
    t.uuid('id').primary();
    t.uuid('case_id').notNullable().references('id').inTable('cases').onDelete('CASCADE');
    t.uuid('canal_id');
    t.enu('purpose', ['working-length', 'maf', 'cone-fit', 'fill-check', 'post-op']).notNullable();
    t.string('object_key', 200).notNullable().unique();
    t.string('content_type', 60).notNullable();
    t.integer('size_bytes').notNullable();
    t.integer('uploaded_by').notNullable().references('id').inTable('users');
    t.string('uploaded_at', 30).notNullable();
    t.index(['case_id']);
  });

  await knex.schema.createTable('signoffs', (t) => {
    t.increments('id').primary();
    t.uuid('case_id').notNullable().references('id').inTable('cases').onDelete('CASCADE');
    t.uuid('canal_id');
    t.enu('checkpoint', ['cone-fit', 'fill-check', 'final']).notNullable();
    t.enu('decision', ['approved', 'returned', 'reopened']).notNullable();
    t.text('rubric_json');
    t.text('comment');
    t.integer('attending_id').notNullable().references('id').inTable('users');
    t.string('created_at', 30).notNullable();
    t.index(['case_id']);
  });

  await knex.schema.createTable('comments', (t) => {
    t.increments('id').primary();
    t.uuid('case_id').notNullable().references('id').inTable('cases').onDelete('CASCADE');
    t.uuid('canal_id');
    t.uuid('event_id');
    t.integer('author_id').notNullable().references('id').inTable('users');
    t.text('text').notNullable();
    t.string('created_at', 30).notNullable();
    t.index(['case_id']);
  });

  await knex.schema.createTable('invitations', (t) => {
    t.increments('id').primary();
    t.string('email', 254).notNullable();
    t.enu('role', ['student', 'attending', 'director']).notNullable();
    t.integer('cohort_id').references('id').inTable('cohorts').onDelete('SET NULL');
    t.string('token_hash', 128).notNullable().unique();
    t.integer('invited_by').notNullable().references('id').inTable('users');
    t.string('expires_at', 30).notNullable();
    t.string('accepted_at', 30);
    t.timestamp('created_at').notNullable().defaultTo(knex.fn.now());
    t.index(['email']);
  });

  await knex.schema.createTable('password_resets', (t) => {
    t.increments('id').primary();
    t.integer('user_id').notNullable().references('id').inTable('users').onDelete('CASCADE');
    t.string('token_hash', 128).notNullable().unique();
    t.string('expires_at', 30).notNullable();
    t.string('used_at', 30);
    t.timestamp('created_at').notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable('settings', (t) => {
    t.string('key', 60).primary();
    t.text('value_json').notNullable();
    t.integer('updated_by').references('id').inTable('users');
    t.timestamp('updated_at').notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable('audit_log', (t) => {
    t.increments('id').primary();
    t.string('at', 30).notNullable();
    t.integer('actor_id').references('id').inTable('users');
    t.string('action', 60).notNullable();
    t.string('subject_type', 40);
    t.string('subject_id', 60);
    t.text('detail_json');
    t.index(['subject_type', 'subject_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of [
    'audit_log',
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
  ]) {
    await knex.schema.dropTableIfExists(table);
  }
}
