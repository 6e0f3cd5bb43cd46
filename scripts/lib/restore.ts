/** Putting a backup in place of the database (npm run db:restore), atomically and only when safe. */
import Database from 'better-sqlite3';
import { existsSync, linkSync, renameSync, rmSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { DataFolderBusyError, lockDataFolder } from '../../src/lib/server/data-lock.ts';
import { secureDataDir, secureDbFile } from '../../src/lib/server/files.ts';
import { copyPrivate, fsyncPath, utcStamp } from './backup.ts';

/** A refusal worded for the person restoring; nothing has changed when it is thrown. */
export class RestoreRefused extends Error {}

const codeOf = (err: unknown) => (err as { code?: string }).code ?? '';

/**
 * Refuses anything but a whole Coneline database (SQLite's integrity check and our migrations
 * table), then puts the copy in WAL mode, as every connection of ours would.
 */
function checkBackup(file: string, shownAs: string): void {
  let db: Database.Database | undefined;
  try {
    db = new Database(file, { fileMustExist: true });
    const problems = db.pragma('integrity_check') as { integrity_check: string }[];
    if (problems[0]?.integrity_check !== 'ok') {
      throw new RestoreRefused(
        `${shownAs} fails its integrity check: ${problems
          .map((p) => p.integrity_check)
          .slice(0, 3)
          .join('; ')}`,
      );
    }
    const migrations = db
      .prepare("select count(*) from sqlite_master where type = 'table' and name = 'knex_migrations'")
      .pluck()
      .get();
    if (migrations !== 1)
      throw new RestoreRefused(`${shownAs} is not a Coneline database (it has no knex_migrations table)`);
    db.pragma('journal_mode = WAL');
  } catch (err) {
    if (err instanceof RestoreRefused) throw err;
    if (codeOf(err) === 'SQLITE_NOTADB') throw new RestoreRefused(`${shownAs} is not a SQLite database`);
    if (codeOf(err).startsWith('SQLITE_CORRUPT'))
      throw new RestoreRefused(`${shownAs} fails its integrity check: ${(err as Error).message}`);
    throw err;
  } finally {
    db?.close();
  }
}

/**
 * Proves that no process has the live database open, then closes it cleanly. In WAL mode a
 * plain BEGIN EXCLUSIVE succeeds beside other connections (it only keeps out other writers);
 * exclusive locking mode needs every other connection gone, even an idle one, and answers
 * SQLITE_BUSY otherwise (tried on this stack). Closing the last connection checkpoints the WAL
 * into the file, so the copy kept below is whole.
 */
function checkNobodyHasItOpen(dbFile: string): void {
  const db = new Database(dbFile, { fileMustExist: true, timeout: 0 });
  try {
    db.pragma('locking_mode = EXCLUSIVE');
    db.exec('BEGIN EXCLUSIVE; COMMIT');
    db.pragma('wal_checkpoint(TRUNCATE)');
  } catch (err) {
    if (codeOf(err) === 'SQLITE_BUSY') {
      throw new RestoreRefused(
        'the database is open in another process (user:add, db:backup, or a server with another DATA_DIR?); close it first',
      );
    }
    throw err;
  } finally {
    db.close();
  }
}

/** The data folder's lock for the restore's duration: no server may start on it meanwhile. */
function takeDataFolder(dataDir: string) {
  try {
    return lockDataFolder(dataDir);
  } catch (err) {
    if (err instanceof DataFolderBusyError)
      throw new RestoreRefused(`a Coneline server is running on this data folder (${dataDir}); stop it first`);
    throw err;
  }
}

function removeWalFiles(dbFile: string): void {
  for (const f of [`${dbFile}-wal`, `${dbFile}-shm`]) rmSync(f, { force: true });
}

/**
 * Replaces `dbFile` by `backup`: copied to a temporary file beside the database, flushed,
 * checked, then renamed over it, so the database is at every moment the old one or the new.
 * The database it replaced stays beside it (a hard link: no copy). Returns that file's path.
 */
export function restoreDatabase(backup: string, dbFile: string, dataDir: string, now = new Date()): string | null {
  if (!existsSync(backup)) throw new RestoreRefused(`no such file: ${backup}`);
  const lock = takeDataFolder(dataDir);
  const folder = dirname(dbFile);
  const temp = join(folder, `.${basename(dbFile)}.restoring-${process.pid}`);
  try {
    secureDataDir(folder);
    rmSync(temp, { force: true });
    copyPrivate(backup, temp);
    checkBackup(temp, backup);
    removeWalFiles(temp); // none are left by a clean close; a crash in the check could leave them
    let kept: string | null = null;
    if (existsSync(dbFile)) {
      checkNobodyHasItOpen(dbFile);
      kept = `${dbFile}.before-restore-${utcStamp(now)}`;
      linkSync(dbFile, kept);
    }
    // Stale -wal/-shm of the old file would be read into the new one: gone before it arrives.
    removeWalFiles(dbFile);
    renameSync(temp, dbFile);
    fsyncPath(folder);
    secureDbFile(dbFile);
    return kept;
  } finally {
    rmSync(temp, { force: true });
    lock.release();
  }
}
