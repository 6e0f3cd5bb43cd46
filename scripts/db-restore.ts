/**
 * `npm run db:restore -- FILE`: puts a backup in place of the database. Refuses while a server
 * runs on the data folder or any process has the database open, and refuses a file that is not
 * a whole Coneline database. The database it replaces is kept beside it.
 */
import { resolve } from 'node:path';
import { parseArgs } from 'node:util';
import { restoreDatabase, RestoreRefused } from './lib/restore.ts';
import { dataPaths } from '../src/lib/server/files.ts';

function fail(message: string): never {
  console.error(`db:restore: ${message}`);
  process.exit(1);
}

const USAGE = 'usage: npm run db:restore -- FILE   (stop the server first)';
let positionals: string[] = [];
try {
  ({ positionals } = parseArgs({ allowPositionals: true, strict: true }));
} catch (err) {
  fail(`${(err as Error).message}\n${USAGE}`);
}
if (positionals.length !== 1) fail(USAGE);
const backup = resolve(positionals[0]!);
const { dbFile, dataDir } = dataPaths();
try {
  const kept = restoreDatabase(backup, dbFile, dataDir);
  console.log(`Restored ${backup} into ${dbFile}${kept ? `; the database it replaced is kept as ${kept}` : ''}.`);
} catch (err) {
  fail(err instanceof RestoreRefused ? err.message : `${(err as Error).message} (the database was not changed)`);
}
