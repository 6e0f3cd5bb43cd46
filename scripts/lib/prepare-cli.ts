/** `tsx scripts/lib/prepare-cli.ts FILE [--seed]`: migrates FILE and seeds it when asked. */
import { resolve } from 'node:path';
import { prepareDb } from './dbtasks.ts';

const [file, flag] = process.argv.slice(2);
if (!file) {
  console.error('usage: prepare-cli.ts FILE [--seed]');
  process.exit(2);
}
await prepareDb(resolve(file), { seed: flag === '--seed' });
