/** Knex settings shared by the server, the CLI (knexfile.ts) and the tests. */
import type { Knex } from 'knex';

interface SqliteConnection {
  pragma(sql: string): unknown;
}

/**
 * Every connection sets WAL, synchronous=FULL and foreign keys: better-sqlite3 quietly
 * defaults WAL databases to NORMAL after the first open.
 */
export function sqliteOptions(filename: string): Knex.Config {
  return {
    client: 'better-sqlite3',
    connection: { filename },
    useNullAsDefault: true,
    pool: {
      min: 1,
      max: 1,
      afterCreate(conn: SqliteConnection, done: (err: Error | null, conn: unknown) => void) {
        try {
          conn.pragma('journal_mode = WAL');
          conn.pragma('synchronous = FULL');
          conn.pragma('foreign_keys = ON');
          conn.pragma('busy_timeout = 5000');
          done(null, conn);
        } catch (err) {
          done(err as Error, conn);
        }
      },
    },
  };
}
