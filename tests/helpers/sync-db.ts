/** A migrated SQLite file of its own with two students, for calling the sync service in-process. */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import knexFactory, { type Knex } from 'knex';
import { bundledMigrations } from '../../src/lib/server/db';
import { sqliteOptions } from '../../src/lib/server/knex-options';

export interface SyncDb {
  k: Knex;
  /** Two students' user ids. */
  ana: number;
  ben: number;
  close(): Promise<void>;
}

export async function syncDb(): Promise<SyncDb> {
  const dir = mkdtempSync(join(tmpdir(), 'coneline-sync-'));
  const k = knexFactory(sqliteOptions(join(dir, 'db.sqlite')));
  await k.migrate.latest({ migrationSource: bundledMigrations });
  const id = async (email: string) => {
    const [row] = await k('users').insert({ email, name: email, role: 'student' }).returning('id');
    return row!.id;
  };
  const ana = await id('ana@test.example');
  const ben = await id('ben@test.example');
  return {
    k,
    ana,
    ben,
    async close() {
      await k.destroy();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
