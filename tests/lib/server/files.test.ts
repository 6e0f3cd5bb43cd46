import { chmodSync, mkdirSync, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import knexFactory from 'knex';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { secureDataDir, secureDbFile } from '../../../src/lib/server/files';
import { sqliteOptions } from '../../../src/lib/server/knex-options';

const mode = (path: string) => statSync(path).mode & 0o7777;

let dir: string;
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'coneline-files-'));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

/**
 * Opens the file as every connection does (WAL) and writes, so SQLite makes -wal and -shm, and
 * reads the three modes while the connection is open (closing the last one removes the two).
 */
async function modesWhileOpen(file: string): Promise<number[]> {
  const k = knexFactory(sqliteOptions(file));
  try {
    await k.raw('create table if not exists t (x integer)');
    await k('t').insert({ x: 1 });
    return [mode(file), mode(`${file}-wal`), mode(`${file}-shm`)];
  } finally {
    await k.destroy();
  }
}

describe('secureDataDir', () => {
  it('creates a missing data folder, and its missing parents, owner-only (0700)', () => {
    const data = join(dir, 'a', 'data');
    secureDataDir(data);
    expect(mode(data)).toBe(0o700);
    expect(mode(join(dir, 'a'))).toBe(0o700);
  });

  it('takes an existing data folder back to 0700', () => {
    const data = join(dir, 'data');
    mkdirSync(data, { mode: 0o755 });
    chmodSync(data, 0o755);
    secureDataDir(data);
    expect(mode(data)).toBe(0o700);
  });

  it('leaves a shared sticky folder such as /tmp as it is', () => {
    const shared = join(dir, 'shared');
    mkdirSync(shared);
    chmodSync(shared, 0o1777);
    secureDataDir(shared);
    expect(mode(shared)).toBe(0o1777);
  });
});

describe('secureDbFile', () => {
  it('creates the database file empty and owner-only (0600), in a 0700 folder, before SQLite opens it', () => {
    const file = join(dir, 'data', 'coneline.sqlite');
    secureDbFile(file);
    expect(statSync(file).size).toBe(0);
    expect(mode(file)).toBe(0o600);
    expect(mode(join(dir, 'data'))).toBe(0o700);
  });

  it("relies on SQLite giving the -wal and -shm files the main file's mode", async () => {
    // SQLite's own behaviour, checked with a mode of our choosing, so the 0600 below is not luck.
    const other = join(dir, 'other.sqlite');
    writeFileSync(other, '');
    chmodSync(other, 0o640);
    expect(await modesWhileOpen(other)).toEqual([0o640, 0o640, 0o640]);

    const file = join(dir, 'coneline.sqlite');
    secureDbFile(file);
    expect(await modesWhileOpen(file)).toEqual([0o600, 0o600, 0o600]);
  });

  it('takes an existing database and its -wal and -shm back to 0600, keeping their contents', async () => {
    const file = join(dir, 'coneline.sqlite');
    await modesWhileOpen(file);
    const k = knexFactory(sqliteOptions(file));
    try {
      await k('t').insert({ x: 2 }); // the -wal and -shm stay while this connection is open
      for (const f of [file, `${file}-wal`, `${file}-shm`]) chmodSync(f, 0o644);
      secureDbFile(file);
      expect([mode(file), mode(`${file}-wal`), mode(`${file}-shm`)]).toEqual([0o600, 0o600, 0o600]);
      expect(await k('t').count({ n: '*' }).first()).toEqual({ n: 2 });
    } finally {
      await k.destroy();
    }
  });
});
