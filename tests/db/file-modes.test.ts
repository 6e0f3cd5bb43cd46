// Every path that opens the database keeps it owner-only: the CLI and npm start (dbtasks), the
// Knex CLI (knexfile.ts) and the built server's db(). The auth secret: tests/lib/server/auth-secret.test.ts.
import { execFileSync } from 'node:child_process';
import { chmodSync, existsSync, mkdirSync, mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ROOT, TSX } from '../helpers/paths';
import { startServer } from '../helpers/server';

const mode = (path: string) => statSync(path).mode & 0o7777;
const dbModes = (file: string) => [file, `${file}-wal`, `${file}-shm`].filter(existsSync).map(mode);

/** scripts/lib/dbtasks.ts's prepareDb, under tsx as npm start runs it (it loads .ts migrations). */
function prepareDb(file: string): void {
  execFileSync(process.execPath, [TSX, 'scripts/lib/prepare-cli.ts', file], { cwd: ROOT, stdio: 'pipe' });
}

let dir: string;
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'coneline-modes-'));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

describe('prepareDb (npm start, user:add, the tests)', () => {
  it('creates the data folder 0700 and the database 0600', () => {
    const file = join(dir, 'data', 'coneline.sqlite');
    prepareDb(file);
    expect(mode(join(dir, 'data'))).toBe(0o700);
    expect(dbModes(file)).toEqual([0o600]);
  });

  it('takes an existing database and data folder with wider modes back to owner-only', () => {
    const data = join(dir, 'data');
    const file = join(data, 'coneline.sqlite');
    prepareDb(file);
    chmodSync(data, 0o755);
    chmodSync(file, 0o644);
    prepareDb(file);
    expect(mode(data)).toBe(0o700);
    expect(dbModes(file)).toEqual([0o600]);
  });
});

describe('the Knex CLI (knexfile.ts)', () => {
  it('creates the data folder 0700 and the database 0600', () => {
    const file = join(dir, 'cli', 'coneline.sqlite');
    execFileSync(
      process.execPath,
      [TSX, 'node_modules/knex/bin/cli.js', 'migrate:latest', '--knexfile', 'knexfile.ts'],
      {
        cwd: ROOT,
        env: { ...process.env, DB_FILE: file },
        stdio: 'pipe',
      },
    );
    expect(mode(join(dir, 'cli'))).toBe(0o700);
    expect(dbModes(file).every((m) => m === 0o600)).toBe(true);
  });
});

describe("the built server's db()", () => {
  it('creates the database 0600 in a 0700 folder, taking the data folder back to 0700', async () => {
    const data = join(dir, 'srv');
    mkdirSync(data, { mode: 0o755 });
    chmodSync(data, 0o755);
    const file = join(data, 'db', 'coneline.sqlite');
    const server = await startServer({ emptyDb: true, env: { DB_FILE: file, DATA_DIR: data } });
    try {
      // The server opens (and migrates) its database at start; /api/health answers once it has.
      expect((await fetch(`${server.baseUrl}/api/health`)).status).toBe(200);
      expect(existsSync(file)).toBe(true);
      expect(mode(data)).toBe(0o700);
      expect(mode(join(data, 'db'))).toBe(0o700);
      expect(dbModes(file).every((m) => m === 0o600)).toBe(true);
      expect(dbModes(file).length).toBeGreaterThan(1); // -wal and -shm exist while the server runs
    } finally {
      await server.stop();
    }
  });
});
