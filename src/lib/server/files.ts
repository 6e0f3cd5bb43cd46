/**
 * Owner-only modes for the data folder and the database files: the database holds patients'
 * chart numbers and students' records, and SQLite creates its files 0644 (world-readable)
 * under the usual umask. Explicit modes rather than a process-wide umask, so nothing else the
 * process writes changes. No imports beyond node: the server, the scripts (tsx) and
 * knexfile.ts all load this file.
 */
import { chmodSync, closeSync, existsSync, mkdirSync, openSync, statSync } from 'node:fs';
import { dirname, resolve } from 'node:path';

export const DIR_MODE = 0o700;
export const FILE_MODE = 0o600;

const STICKY = 0o1000;

/** Where the database and the data folder are, from DB_FILE and DATA_DIR (config.ts reads it too). */
export function dataPaths(env: NodeJS.ProcessEnv = process.env): { dbFile: string; dataDir: string } {
  const dbFile = resolve(env.DB_FILE || 'data/coneline.sqlite');
  return { dbFile, dataDir: env.DATA_DIR ? resolve(env.DATA_DIR) : dirname(dbFile) };
}

/**
 * Creates the folder (and missing parents) 0700, or takes an existing one to 0700. A shared
 * sticky folder such as /tmp (DB_FILE=/tmp/x.sqlite) or / is left as it is: taking it away from
 * everyone else would break the machine, and the files in it are owner-only anyway.
 */
export function secureDataDir(dir: string): void {
  mkdirSync(dir, { recursive: true, mode: DIR_MODE });
  const st = statSync(dir);
  if (st.mode & STICKY || dirname(dir) === dir) return;
  if ((st.mode & 0o7777) !== DIR_MODE) chmodSync(dir, DIR_MODE);
}

/** Takes an existing file to 0600; a missing one is no error. */
export function securePrivateFile(file: string): void {
  try {
    chmodSync(file, FILE_MODE);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'ENOENT') throw err;
  }
}

/** Creates the file empty and 0600 if it is missing (never truncates); true when it made it. */
export function createPrivateFile(file: string): boolean {
  try {
    closeSync(openSync(file, 'wx', FILE_MODE));
    return true;
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'EEXIST') return false;
    throw err;
  }
}

/**
 * Call before opening the database. An empty file is a valid empty SQLite database, so making
 * it 0600 first means SQLite never creates it 0644; SQLite then gives the -wal and -shm files
 * the main file's mode (tests/lib/server/files.test.ts checks that). Files left by an older
 * copy with wider modes are taken back to 0600.
 */
export function secureDbFile(file: string): void {
  secureDataDir(dirname(file));
  if (!createPrivateFile(file)) securePrivateFile(file);
  for (const extra of [`${file}-wal`, `${file}-shm`]) if (existsSync(extra)) securePrivateFile(extra);
}
