/**
 * Which process owns the data folder: the running server, or db:restore while it replaces the
 * database. The owner holds an exclusive SQLite lock on `coneline.lock` in the folder. The
 * operating system drops that lock when the process ends, however it ends, so a crash leaves
 * nothing stale behind (a pid file would, and pids are reused).
 */
import Database from 'better-sqlite3';
import { join, resolve } from 'node:path';
import { createPrivateFile, secureDataDir, securePrivateFile } from './files';

export const LOCK_FILE = 'coneline.lock';

export class DataFolderBusyError extends Error {}

export interface DataFolderLock {
  release(): void;
}

/** Takes the data folder's lock, or throws DataFolderBusyError when another holder has it. */
export function lockDataFolder(dataDir: string): DataFolderLock {
  secureDataDir(dataDir);
  const file = join(dataDir, LOCK_FILE);
  if (!createPrivateFile(file)) securePrivateFile(file);
  const conn = new Database(file, { timeout: 0 });
  try {
    // No journal file; exclusive locking mode keeps the lock until the connection closes.
    conn.pragma('journal_mode = MEMORY');
    conn.pragma('locking_mode = EXCLUSIVE');
    conn.exec('BEGIN EXCLUSIVE');
  } catch (err) {
    conn.close();
    if ((err as { code?: string }).code === 'SQLITE_BUSY') {
      throw new DataFolderBusyError(`${dataDir} is in use by a running Coneline server or a restore`);
    }
    throw err;
  }
  return { release: () => conn.open && conn.close() };
}

// On globalThis so that a dev server re-evaluating this module does not lock itself out.
const HELD = Symbol.for('coneline.heldDataFolders');
type Registry = Record<symbol, Map<string, DataFolderLock> | undefined>;

/**
 * The server's hold on its data folder, for the life of the process: db:restore refuses while
 * it is held. Call once at start-up (db() calls it too); calling again is harmless.
 */
export function holdDatabaseLock(dataDir: string): void {
  const registry = globalThis as unknown as Registry;
  const held = (registry[HELD] ??= new Map());
  const dir = resolve(dataDir);
  if (!held.has(dir)) held.set(dir, lockDataFolder(dir));
}
