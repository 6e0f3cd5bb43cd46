/** Migrating and seeding from the command line and the test harness (run under tsx). */
import knexFactory, { type Knex } from 'knex';
import { resolve } from 'node:path';
import { activeDemoAccounts } from '../../src/lib/server/demo.ts';
import { secureDbFile } from '../../src/lib/server/files.ts';
import { sqliteOptions } from '../../src/lib/server/knex-options.ts';

const root = resolve(import.meta.dirname, '../..');

export function openDb(file: string): Knex {
  secureDbFile(file);
  return knexFactory({
    ...sqliteOptions(file),
    migrations: { directory: resolve(root, 'db/migrations'), extension: 'ts', loadExtensions: ['.ts'] },
    seeds: { directory: resolve(root, 'db/seeds'), extension: 'ts', loadExtensions: ['.ts'] },
  });
}

/** Runs the latest migrations; seeds the demo when asked, or when `ifEmpty` and no account exists. */
export async function prepareDb(
  file: string,
  opts: { seed?: boolean; seedIfEmpty?: boolean } = {},
): Promise<{ seeded: boolean }> {
  const k = openDb(file);
  try {
    await k.migrate.latest();
    let seed = opts.seed ?? false;
    if (!seed && opts.seedIfEmpty) {
      const [row] = (await k('users').count({ n: '*' })) as { n: number | string }[];
      seed = Number(row?.n ?? 0) === 0;
    }
    if (seed) await k.seed.run();
    return { seeded: seed };
  } finally {
    await k.destroy();
  }
}

/** What `npm run serve` checks before starting: demo accounts still active, and whether anyone can sign in. */
export async function installFacts(file: string): Promise<{ activeDemoAccounts: number; activeAccounts: number }> {
  const k = openDb(file);
  try {
    const row = (await k('users').where({ active: true }).count({ n: '*' }).first()) as
      { n: number | string } | undefined;
    return { activeDemoAccounts: await activeDemoAccounts(k), activeAccounts: Number(row?.n ?? 0) };
  } finally {
    await k.destroy();
  }
}
