import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import knexFactory, { type Knex } from 'knex';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { bundledMigrations } from '../../src/lib/server/db';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import { ROOT, TSX } from '../helpers/paths';

const DOMAIN_TABLES = [
  'users',
  'cohorts',
  'assignments',
  'cases',
  'canals',
  'events',
  'findings',
  'radiographs',
  'signoffs',
  'comments',
  'invitations',
  'password_resets',
  'settings',
  'audit_log',
];

/** Steps down, one migration at a time, until `name` (a file name) has been undone. */
async function undoThrough(k: Knex, name: string): Promise<void> {
  for (;;) {
    const [done] = (await k.migrate.list({ migrationSource: bundledMigrations })) as [{ name: string }[], unknown[]];
    if (!done.some((m) => (typeof m === 'string' ? m : m.name) === name)) return;
    await k.migrate.down({ migrationSource: bundledMigrations });
  }
}

async function tables(k: Knex): Promise<string[]> {
  const rows = (await k.raw("select name from sqlite_master where type = 'table' and name not like 'sqlite_%'")) as {
    name: string;
  }[];
  return rows.map((r) => r.name).sort();
}

describe('the migrations', () => {
  let dir: string;
  let k: Knex;
  beforeEach(() => {
    dir = mkdtempSync(join(tmpdir(), 'coneline-mig-'));
    k = knexFactory(sqliteOptions(join(dir, 'db.sqlite')));
  });
  afterEach(async () => {
    await k.destroy();
    rmSync(dir, { recursive: true, force: true });
  });

  it('create every table of the domain on an empty database and drop them all again', async () => {
    await k.migrate.latest({ migrationSource: bundledMigrations });
    expect(await tables(k)).toEqual(expect.arrayContaining(DOMAIN_TABLES));
    await k.migrate.rollback({ migrationSource: bundledMigrations }, true);
    const left = (await tables(k)).filter((t) => !t.startsWith('knex_'));
    expect(left).toEqual([]);
    await k.migrate.latest({ migrationSource: bundledMigrations });
    expect(await tables(k)).toEqual(expect.arrayContaining(DOMAIN_TABLES));
  });

  it('set WAL, synchronous=FULL and foreign keys on every connection', async () => {
    const raw = await k.client.acquireConnection();
    try {
      expect(raw.pragma('journal_mode', { simple: true })).toBe('wal');
      expect(raw.pragma('synchronous', { simple: true })).toBe(2); // 2 = FULL
      expect(raw.pragma('foreign_keys', { simple: true })).toBe(1);
    } finally {
      await k.client.releaseConnection(raw);
    }
  });

  it('refuse a canal whose case does not exist (foreign keys are on)', async () => {
    await k.migrate.latest({ migrationSource: bundledMigrations });
    await expect(
      k('canals').insert({
        id: '00000000-0000-4000-8000-000000000001',
        case_id: '00000000-0000-4000-8000-000000000002',
        name: 'MB',
        status: 'set-up',
        state_json: '{}',
      }),
    ).rejects.toThrow(/FOREIGN KEY/);
  });

  it('mark no account or cohort as demo unless the demo seed says so, and roll the marker back keeping the accounts', async () => {
    await k.migrate.latest({ migrationSource: bundledMigrations });
    const [cohortId] = (await k('cohorts').insert({ name: 'Class of 2030' }).returning('id')).map(
      (r) => (r as { id: number }).id,
    );
    const [userId] = (
      await k('users')
        .insert({ email: 'real@example.org', name: 'Real Director', role: 'director', cohort_id: cohortId })
        .returning('id')
    ).map((r) => (r as { id: number }).id);
    await k('sessions').insert({
      id: 's1',
      user_id: userId,
      created_at: '2026-12-03T00:00:00Z',
      expires_at: '2026-12-04T00:00:00Z',
    });
    expect(await k('users').first('demo')).toMatchObject({ demo: 0 });
    expect(await k('cohorts').first('demo')).toMatchObject({ demo: 0 });
    // Every later migration is undone first.
    await undoThrough(k, '20261203000200_demo_marker.ts');
    const user: unknown = await k('users').first();
    expect(user).not.toHaveProperty('demo');
    // Rebuilding the tables must not fire their foreign keys' ON DELETE actions.
    expect(user).toMatchObject({ email: 'real@example.org', cohort_id: cohortId });
    expect(await k('sessions').pluck('id')).toEqual(['s1']);
  });

  it('add a discard column to cases, and roll it back keeping every case, canal and event', async () => {
    await k.migrate.latest({ migrationSource: bundledMigrations });
    const [userId] = (
      await k('users').insert({ email: 'd@example.org', name: 'D', role: 'student' }).returning('id')
    ).map((r) => (r as { id: number }).id);
    const caseId = '00000000-0000-4000-8000-000000000020';
    await k('cases').insert({ id: caseId, student_id: userId, setting: 'block', opened_at: '2026-12-01T09:00:00Z' });
    await k('canals').insert({
      id: '00000000-0000-4000-8000-000000000021',
      case_id: caseId,
      name: 'Main',
      status: 'set-up',
      state_json: '{}',
    });
    await k('cases').where({ id: caseId }).update({ discarded_at: '2026-12-01T09:05:00Z' });
    await undoThrough(k, '20261203000400_discarded_cases.ts');
    const row: unknown = await k('cases').where({ id: caseId }).first();
    expect(row).not.toHaveProperty('discarded_at');
    // Rebuilding cases must not cascade to its canals.
    expect(await k('canals').where({ case_id: caseId })).toHaveLength(1);
    await k.migrate.latest({ migrationSource: bundledMigrations });
    expect(await k('cases').where({ id: caseId }).first('discarded_at')).toEqual({ discarded_at: null });
  });

  it('open a history row for every finding already stored, split the old tolerances row, and roll back keeping the findings', async () => {
    await k.migrate.latest({ migrationSource: bundledMigrations });
    await undoThrough(k, '20261203000300_projection.ts');
    const [userId] = (
      await k('users').insert({ email: 's@example.org', name: 'S', role: 'student' }).returning('id')
    ).map((r) => (r as { id: number }).id);
    const caseId = '00000000-0000-4000-8000-000000000010';
    const canalId = '00000000-0000-4000-8000-000000000011';
    await k('cases').insert({ id: caseId, student_id: userId, setting: 'block', opened_at: '2026-12-01T09:00:00Z' });
    await k('canals').insert({ id: canalId, case_id: caseId, name: 'Main', status: 'set-up', state_json: '{}' });
    await k('findings').insert({
      canal_id: canalId,
      case_id: caseId,
      code: 'fill-voids',
      severity: 'stop',
      message: 'm',
    });
    await k('settings').insert({ key: 'tolerances', value_json: '{"minAccessoryCones":4,"oops":"x"}' });

    await k.migrate.latest({ migrationSource: bundledMigrations });
    expect(await k('finding_history').select('canal_id', 'code', 'cleared_at')).toEqual([
      { canal_id: canalId, code: 'fill-voids', cleared_at: null },
    ]);
    expect(await k('settings').select('key', 'value_json')).toEqual([{ key: 'minAccessoryCones', value_json: '4' }]);
    expect(await k('settings_version').first('version')).toEqual({ version: 1 });

    // Dropping the canals' new columns rebuilds the table; its findings must survive it.
    await k.migrate.down({ migrationSource: bundledMigrations });
    expect(await k('findings').pluck('code')).toEqual(['fill-voids']);
  });

  it('give sign-offs and comments their client ids and add the mail outbox, and roll back keeping every sign-off, comment and user', async () => {
    await k.migrate.latest({ migrationSource: bundledMigrations });
    const [userId] = (
      await k('users').insert({ email: 'a@example.org', name: 'A', role: 'attending' }).returning('id')
    ).map((r) => (r as { id: number }).id);
    const caseId = '00000000-0000-4000-8000-000000000030';
    await k('cases').insert({ id: caseId, student_id: userId, setting: 'block', opened_at: '2026-12-01T09:00:00Z' });
    const at = '2026-12-02T09:00:00Z';
    await k('signoffs').insert({
      case_id: caseId,
      checkpoint: 'final',
      decision: 'approved',
      attending_id: userId,
      created_at: at,
      client_id: '00000000-0000-4000-8000-000000000031',
    });
    await k('comments').insert({ case_id: caseId, author_id: userId, text: 'Fine', created_at: at });
    await k('mail_outbox').insert({
      id: '00000000-0000-4000-8000-000000000032',
      recipient_id: userId,
      to_address: 'a@example.org',
      case_id: caseId,
      kind: 'approved',
      subject: 's',
      body_text: 'b',
      status: 'pending',
      next_attempt_at: at,
      created_at: at,
    });
    await expect(
      k('signoffs').insert({
        case_id: caseId,
        checkpoint: 'final',
        decision: 'approved',
        attending_id: userId,
        created_at: at,
        client_id: '00000000-0000-4000-8000-000000000031',
      }),
    ).rejects.toThrow(/UNIQUE/);
    await undoThrough(k, '20261204000100_review_and_mail.ts');
    expect(await tables(k)).not.toContain('mail_outbox');
    expect(await k('signoffs').first()).not.toHaveProperty('client_id');
    expect(await k('signoffs').where({ case_id: caseId })).toHaveLength(1);
    expect(await k('comments').where({ case_id: caseId })).toHaveLength(1);
    expect(await k('users').first()).not.toHaveProperty('mail_digest');
    expect(await k('cases').where({ id: caseId })).toHaveLength(1);
  });

  it('let a cohort be archived and index the case list, and roll back keeping every cohort and its students', async () => {
    await k.migrate.latest({ migrationSource: bundledMigrations });
    const [cohortId] = (
      await k('cohorts').insert({ name: 'Class of 2031', archived_at: '2026-12-05T10:00:00.000Z' }).returning('id')
    ).map((r) => (r as { id: number }).id);
    await k('users').insert({ email: 's@example.org', name: 'S', role: 'student', cohort_id: cohortId });
    const indexes = async () =>
      (
        (await k.raw("select name from sqlite_master where type = 'index' and tbl_name = 'cases'")) as {
          name: string;
        }[]
      ).map((r) => r.name);
    expect(await indexes()).toContain('cases_opened_at_id_index');
    await undoThrough(k, '20261205000500_cohort_archive.ts');
    expect(await indexes()).not.toContain('cases_opened_at_id_index');
    expect(await k('cohorts').first()).not.toHaveProperty('archived_at');
    expect(await k('cohorts').first()).toMatchObject({ id: cohortId, name: 'Class of 2031' });
    // Rebuilding cohorts must not fire users' ON DELETE SET NULL.
    expect(await k('users').where({ email: 's@example.org' }).first()).toMatchObject({ cohort_id: cohortId });
  });

  it('are recorded under the same names by the Knex CLI and by the server', async () => {
    const file = join(dir, 'cli.sqlite');
    execFileSync(
      process.execPath,
      [TSX, 'node_modules/knex/bin/cli.js', 'migrate:latest', '--knexfile', 'knexfile.ts'],
      {
        cwd: ROOT,
        env: { ...process.env, DB_FILE: file },
        stdio: 'pipe',
      },
    );
    const cli = knexFactory(sqliteOptions(file));
    try {
      const ran = ((await cli('knex_migrations').select('name').orderBy('id')) as { name: string }[]).map(
        (r) => r.name,
      );
      const bundled = (await bundledMigrations.getMigrations([])).map((m) => bundledMigrations.getMigrationName(m));
      expect(ran).toEqual(bundled);
      const [, pending] = (await cli.migrate.list({ migrationSource: bundledMigrations })) as [unknown[], unknown[]];
      expect(pending).toEqual([]);
    } finally {
      await cli.destroy();
    }
  });
});
