// npm run db:backup and db:restore on a real install's data folder, under write load.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { ROOT, TSX } from '../helpers/paths';
import { startServer } from '../helpers/server';

const mode = (path: string) => statSync(path).mode & 0o7777;

let dir: string;
let data: string;
let dbFile: string;
let env: NodeJS.ProcessEnv;

function run(script: string, ...args: string[]) {
  const r = spawnSync(process.execPath, [TSX, script, ...args], { cwd: ROOT, env, encoding: 'utf8', timeout: 60_000 });
  return { code: r.status, out: r.stdout, err: r.stderr };
}
/** Like run, but without blocking this process, so the writer's progress can be read meanwhile. */
function runAsync(script: string, ...args: string[]): Promise<{ code: number | null; out: string; err: string }> {
  const child = spawn(process.execPath, [TSX, script, ...args], { cwd: ROOT, env, stdio: ['ignore', 'pipe', 'pipe'] });
  let out = '';
  let err = '';
  child.stdout.on('data', (d: Buffer) => (out += d.toString()));
  child.stderr.on('data', (d: Buffer) => (err += d.toString()));
  return new Promise((resolve) => child.on('exit', (code) => resolve({ code, out, err })));
}

/** Reads from the file as a short-lived connection of its own. */
function query<T>(file: string, sql: string): T {
  const db = new Database(file, { readonly: true, fileMustExist: true });
  try {
    return db.prepare(sql).pluck().get() as T;
  } finally {
    db.close();
  }
}
const committed = (file: string) => query<number | null>(file, 'select max(n) from load_rows') ?? 0;
const integrity = (file: string) => query<string>(file, 'pragma integrity_check');
/** Rows 1..upTo are all there when the count of rows numbered up to it equals it. */
const hasRowsUpTo = (file: string, upTo: number) =>
  query<number>(file, `select count(*) from load_rows where n <= ${upTo}`) === upTo;

/**
 * A writer process as the server is one: WAL, synchronous=FULL, one commit per row, numbered
 * 1, 2, 3… so that "every row committed before the backup" is a count. Stops by itself.
 */
function startWriter(file: string): ChildProcess {
  const code = `
    const Database = require('better-sqlite3');
    const db = new Database(process.argv[1]);
    db.pragma('journal_mode = WAL'); db.pragma('synchronous = FULL'); db.pragma('busy_timeout = 5000');
    const insert = db.prepare('insert into load_rows (n, payload) values (?, ?)');
    let n = db.prepare('select coalesce(max(n), 0) from load_rows').pluck().get();
    const until = Date.now() + 60000;
    const stop = () => { db.close(); process.exit(0); };
    process.on('SIGTERM', stop);
    (function tick() {
      for (let i = 0; i < 20; i++) insert.run(++n, 'p'.repeat(300));
      if (Date.now() < until) setImmediate(tick); else stop();
    })();`;
  return spawn(process.execPath, ['-e', code, file], { cwd: ROOT, stdio: 'ignore' });
}
async function stopWriter(writer: ChildProcess): Promise<void> {
  if (writer.exitCode !== null) return;
  const exited = new Promise((r) => writer.once('exit', r));
  writer.kill('SIGTERM');
  await exited;
}
async function until(check: () => boolean, what: string): Promise<void> {
  for (const deadline = Date.now() + 20_000; !check(); await new Promise((r) => setTimeout(r, 50))) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
  }
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'coneline-backup-'));
  data = join(dir, 'data');
  dbFile = join(data, 'coneline.sqlite');
  env = { ...process.env, DB_FILE: dbFile, DATA_DIR: data };
  expect(run('scripts/lib/prepare-cli.ts', dbFile).code).toBe(0);
  // A few megabytes of rows, so the backup is not over in an instant.
  const db = new Database(dbFile);
  db.pragma('journal_mode = WAL');
  db.exec('create table load_rows (n integer primary key, payload text not null)');
  const insert = db.prepare('insert into load_rows (n, payload) values (?, ?)');
  db.transaction(() => {
    for (let n = 1; n <= 20_000; n++) insert.run(n, 'p'.repeat(300));
  })();
  db.close();
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('npm run db:backup, then db:restore', () => {
  let writer: ChildProcess | undefined;
  afterEach(async () => {
    if (writer) await stopWriter(writer);
  });

  it('backs up while a writer commits, refuses to restore under it, and restores every row committed before the backup', async () => {
    writer = startWriter(dbFile);
    await until(() => committed(dbFile) > 20_200, 'the writer to commit');
    const before = committed(dbFile);
    const backup = await runAsync('scripts/db-backup.ts');
    const during = committed(dbFile);
    expect(backup.err).toBe('');
    expect(backup.code).toBe(0);
    expect(during).toBeGreaterThan(before); // the writer kept committing while the backup ran

    const path = backup.out.trim();
    expect(path).toMatch(new RegExp(`^${join(data, 'backups')}/coneline-\\d{8}T\\d{6}Z\\.sqlite$`));
    expect([mode(join(data, 'backups')), mode(path)]).toEqual([0o700, 0o600]);
    expect(readdirSync(join(data, 'backups'))).toEqual([path.slice(path.lastIndexOf('/') + 1)]);
    expect(integrity(path)).toBe('ok');
    expect(hasRowsUpTo(path, before)).toBe(true);
    const inBackup = committed(path);

    // A connection holds the database: no restore under it.
    const refused = run('scripts/db-restore.ts', path);
    expect(refused.code).toBe(1);
    expect(refused.err).toContain('the database is open in another process');
    expect(readdirSync(data).filter((f) => f.includes('.restoring-'))).toEqual([]);

    await stopWriter(writer);
    const final = committed(dbFile);
    expect(final).toBeGreaterThan(inBackup);

    const restored = run('scripts/db-restore.ts', path);
    expect(restored.err).toBe('');
    expect(restored.code).toBe(0);
    expect(existsSync(`${dbFile}-wal`)).toBe(false); // no stale WAL of the old file
    expect(integrity(dbFile)).toBe('ok');
    expect(hasRowsUpTo(dbFile, before)).toBe(true);
    expect(committed(dbFile)).toBe(inBackup);
    expect(mode(dbFile)).toBe(0o600);
    expect(query<number>(dbFile, 'select count(*) from knex_migrations')).toBeGreaterThan(0);

    // The database it replaced is kept beside it, whole, and said where.
    const kept = /kept as (\S+?)\.?$/m.exec(restored.out)?.[1];
    expect(kept && existsSync(kept)).toBe(true);
    expect([committed(kept!), mode(kept!)]).toEqual([final, 0o600]);
  });

  it('writes to --out FILE, and will not overwrite a file that is there', () => {
    const out = join(dir, 'elsewhere', 'nightly.sqlite');
    const r = run('scripts/db-backup.ts', '--out', out);
    expect(r.code).toBe(0);
    expect(r.out.trim()).toBe(out);
    expect([mode(out), integrity(out)]).toEqual([0o600, 'ok']);
    const again = run('scripts/db-backup.ts', '--out', out);
    expect(again.code).toBe(1);
    expect(again.err).toContain(`${out} already exists`);
  });
});

describe('npm run db:restore refuses', () => {
  it('while a server holds the data folder (its database lock)', async () => {
    const path = run('scripts/db-backup.ts').out.trim();
    const server = await startServer({ emptyDb: true, env: { DB_FILE: dbFile, DATA_DIR: data } });
    try {
      // The server opens (and migrates) its database at start; /api/health answers once it has.
      expect((await fetch(`${server.baseUrl}/api/health`)).status).toBe(200);
      const r = run('scripts/db-restore.ts', path);
      expect(r.code).toBe(1);
      expect(r.err).toContain('a Coneline server is running on this data folder');
    } finally {
      await server.stop();
    }
    expect(run('scripts/db-restore.ts', path).code).toBe(0);
  });

  it.each([
    ['a file that is not a database', () => 'not a database at all\n'.repeat(200), 'is not a SQLite database'],
    [
      'a SQLite database that is not Coneline',
      () => {
        const f = join(dir, 'other.sqlite');
        const db = new Database(f);
        db.exec('create table notes (x text)');
        db.close();
        return readFileSync(f);
      },
      'is not a Coneline database (it has no knex_migrations table)',
    ],
    [
      'a damaged Coneline database',
      () => {
        const bytes = readFileSync(run('scripts/db-backup.ts').out.trim());
        bytes.fill(0x5a, bytes.length - 3 * 4096, bytes.length - 4096); // two pages of the row table
        return bytes;
      },
      'fails its integrity check',
    ],
  ])('%s, leaving the database as it was', (_label, contents, message) => {
    const bad = join(dir, `bad-${Math.random().toString(36).slice(2)}.sqlite`);
    writeFileSync(bad, contents());
    const rows = committed(dbFile);
    const r = run('scripts/db-restore.ts', bad);
    expect(r.code).toBe(1);
    expect(r.err).toContain(message);
    expect(r.err).not.toMatch(/\n\s+at /);
    expect([committed(dbFile), integrity(dbFile)]).toEqual([rows, 'ok']);
    expect(readdirSync(data).filter((f) => f.includes('.restoring-'))).toEqual([]);
  });

  it('without a file, or with one that is missing, with a usage line', () => {
    expect(run('scripts/db-restore.ts').err).toContain('usage: npm run db:restore -- FILE');
    const r = run('scripts/db-restore.ts', join(dir, 'missing.sqlite'));
    expect(r.code).toBe(1);
    expect(r.err).toContain('no such file');
  });
});
