// The Knex CLI's settings. Run it through tsx (see package.json's db:* scripts): the CLI
// cannot load TypeScript migrations on its own.
import { mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { sqliteOptions } from './src/lib/server/knex-options.ts';

const filename = resolve(process.env.DB_FILE ?? 'data/coneline.sqlite');
mkdirSync(dirname(filename), { recursive: true });

export default {
  ...sqliteOptions(filename),
  migrations: { directory: './db/migrations', extension: 'ts', loadExtensions: ['.ts'] },
  seeds: { directory: './db/seeds', extension: 'ts', loadExtensions: ['.ts'] },
};
