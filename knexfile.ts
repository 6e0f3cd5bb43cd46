// The Knex CLI's settings. Run it through tsx (see package.json's db:* scripts): the CLI
// cannot load TypeScript migrations on its own.
import { dataPaths, secureDbFile } from './src/lib/server/files.ts';
import { sqliteOptions } from './src/lib/server/knex-options.ts';

const filename = dataPaths().dbFile;
secureDbFile(filename);

export default {
  ...sqliteOptions(filename),
  migrations: { directory: './db/migrations', extension: 'ts', loadExtensions: ['.ts'] },
  seeds: { directory: './db/seeds', extension: 'ts', loadExtensions: ['.ts'] },
};
