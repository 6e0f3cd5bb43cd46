/** Online backups of the database (npm run db:backup), and the file handling restores share. */
import Database from 'better-sqlite3';
import { closeSync, fsyncSync, openSync, readSync, renameSync, rmSync, writeSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { createPrivateFile, FILE_MODE } from '../../src/lib/server/files.ts';

/** `20261203T142233Z`: UTC, so names made with it sort in time order on any machine. */
export function utcStamp(now = new Date()): string {
  return now
    .toISOString()
    .replace(/[-:]/g, '')
    .replace(/\.\d+Z$/, 'Z');
}

/** `data/backups/coneline-20261203T142233Z.sqlite` */
export function defaultBackupPath(dataDir: string, now = new Date()): string {
  return join(dataDir, 'backups', `coneline-${utcStamp(now)}.sqlite`);
}

/** Flushes a file, or a folder's entries (a rename), to the disk. */
export function fsyncPath(path: string): void {
  const fd = openSync(path, 'r');
  try {
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
}

/**
 * Copies `from` into a new file `to`, created 0600 and flushed to disk. Not copyFileSync: it
 * gives the copy the source's mode, and a backup may have been left world-readable.
 */
export function copyPrivate(from: string, to: string): void {
  const src = openSync(from, 'r');
  const dst = openSync(to, 'wx', FILE_MODE);
  try {
    const buf = Buffer.allocUnsafe(1 << 20);
    for (let n; (n = readSync(src, buf, 0, buf.length, null)) > 0;) {
      for (let off = 0; off < n;) off += writeSync(dst, buf, off, n - off);
    }
    fsyncSync(dst);
  } finally {
    closeSync(src);
    closeSync(dst);
  }
}

/**
 * Writes a consistent copy of the live database to `out` with better-sqlite3's online backup
 * API, while the server keeps reading and writing. The copy is made under a temporary name
 * and renamed when whole, so a file named `out` is always a complete backup.
 */
export async function backupDatabase(dbFile: string, out: string): Promise<void> {
  const partial = `${out}.partial`;
  rmSync(partial, { force: true }); // left by a backup that was cut off
  createPrivateFile(partial); // empty and 0600 before SQLite opens it: SQLite would make it 0644
  const source = new Database(dbFile, { fileMustExist: true, timeout: 5000 });
  try {
    // After the first (empty) step, every page in one step: one read transaction, so one
    // consistent moment, which WAL lets the server's writers go on past. Smaller steps start
    // over each time the server commits, and under steady writing might never finish.
    await source.backup(partial, { progress: () => 0x7fffffff });
  } finally {
    source.close();
  }
  const copy = new Database(partial, { fileMustExist: true });
  try {
    // A rollback-journal file stands alone: it can be copied, or opened read-only, without -wal.
    copy.pragma('journal_mode = DELETE');
  } finally {
    copy.close();
  }
  fsyncPath(partial);
  renameSync(partial, out);
  fsyncPath(dirname(out));
}
