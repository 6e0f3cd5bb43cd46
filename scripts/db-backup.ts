/**
 * `npm run db:backup [-- --out FILE]`: a consistent copy of the database, taken while the server
 * runs. Written 0600 to FILE, or to data/backups/coneline-<UTC time>.sqlite (folder 0700); the
 * path is printed on standard output, alone, for scripts.
 */
import { existsSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { parseArgs } from 'node:util';
import { backupDatabase, defaultBackupPath } from './lib/backup.ts';
import { dataPaths, secureDataDir, secureDbFile } from '../src/lib/server/files.ts';

function fail(message: string): never {
  console.error(`db:backup: ${message}`);
  process.exit(1);
}

let values;
try {
  ({ values } = parseArgs({ options: { out: { type: 'string' } }, strict: true }));
} catch (err) {
  fail(`${(err as Error).message}\nusage: npm run db:backup [-- --out FILE]`);
}
const { dbFile, dataDir } = dataPaths();
if (!existsSync(dbFile)) fail(`there is no database at ${dbFile} (DB_FILE)`);
secureDbFile(dbFile); // opening it may create its -wal and -shm: they take its mode
const out = values.out ? resolve(values.out) : defaultBackupPath(dataDir);
if (existsSync(out)) fail(`${out} already exists; name another file with --out`);
// Our own backups folder is kept 0700; a folder named with --out is created so, never changed.
if (!values.out || !existsSync(dirname(out))) secureDataDir(dirname(out));
try {
  await backupDatabase(dbFile, out);
} catch (err) {
  fail((err as Error).message);
}
console.log(out);
