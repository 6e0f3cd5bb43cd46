/** The server's one Knex instance, with the migrations bundled into the build. */
import knexFactory, { type Knex } from 'knex';
import { config } from './config';
import { holdDatabaseLock } from './data-lock';
import { secureDataDir, secureDbFile } from './files';
import { sqliteOptions } from './knex-options';
import { startMailWorker, stopMailWorker } from './mail-worker';
import { startRecompute, stopRecompute } from './recompute';

type MigrationModule = Knex.Migration;

// Bundled at build time so no TypeScript loader is needed at run time; the names are the
// file names, exactly as the Knex CLI records them, so both agree on what has run.
const modules = import.meta.glob<MigrationModule>('../../../db/migrations/*.ts', { eager: true });

export const bundledMigrations: Knex.MigrationSource<string> = {
  async getMigrations() {
    return Object.keys(modules).sort();
  },
  getMigrationName(path) {
    return path.slice(path.lastIndexOf('/') + 1);
  },
  async getMigration(path) {
    const mod = modules[path];
    if (!mod) throw new Error(`migration ${path} is not bundled`);
    return mod;
  },
};

let instance: Knex | null = null;
let ready: Promise<Knex> | null = null;

/** The database, migrated to the latest schema on first use. */
export function db(): Promise<Knex> {
  if (!ready) {
    const { dbFile: file, dataDir } = config();
    secureDataDir(dataDir);
    holdDatabaseLock(dataDir); // db:restore refuses while a server holds it
    secureDbFile(file);
    instance = knexFactory(sqliteOptions(file));
    const k = instance;
    ready = k.migrate.latest({ migrationSource: bundledMigrations }).then(() => {
      // Canals judged by older rules or settings are judged again in the background, going
      // on from where a previous run stopped.
      void startRecompute(k);
      // E-mail waiting in the outbox (from before a restart too) goes out after commit.
      startMailWorker(k);
      return k;
    });
  }
  return ready;
}

export async function closeDb(): Promise<void> {
  if (instance) {
    await stopMailWorker();
    await stopRecompute(instance);
    await instance.destroy();
  }
  instance = null;
  ready = null;
}
