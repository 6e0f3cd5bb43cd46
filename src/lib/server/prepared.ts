/**
 * The hot reads of every request (the session check, a canal and its access check) as
 * prepared statements kept on Knex's own better-sqlite3 connection. Knex builds the SQL and
 * SQLite re-parses it on every query; for these few fixed queries that was most of the data
 * layer's cost under load (docs/performance.md). The connection still comes from Knex's
 * pool, so a read waits for a running write transaction exactly as a Knex query does, and
 * inside a transaction (`k` a Knex.Transaction) it reads through that transaction.
 */
import type { Database, Statement } from 'better-sqlite3';
import type { Knex } from 'knex';

const statements = new WeakMap<Database, Map<string, Statement>>();

/** Runs `read` with a cached statement per SQL text on the pool's connection, then gives it back. */
export async function withStatements<T>(k: Knex, read: (prepare: (sql: string) => Statement) => T): Promise<T> {
  const conn = (await k.client.acquireConnection()) as Database;
  try {
    let mine = statements.get(conn);
    if (!mine) statements.set(conn, (mine = new Map()));
    const cache = mine;
    return read((sql) => {
      let s = cache.get(sql);
      if (!s) cache.set(sql, (s = conn.prepare(sql)));
      return s;
    });
  } finally {
    await k.client.releaseConnection(conn);
  }
}
