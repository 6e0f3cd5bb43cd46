/**
 * Limits on failed sign-ins, kept in SQLite through rate-limiter-flexible (so they hold
 * across restarts and take no memory per guess):
 * - 5 failures for one account from one address in 15 minutes hold that pair, so guessing
 *   a password is slow while the owner, from another address, can still sign in;
 * - 50 failures from one address in 15 minutes hold the address, whatever accounts it tries.
 * A successful sign-in never counts, and clears its own pair.
 */
import type { Knex } from 'knex';
import { RateLimiterSQLite, type RateLimiterRes } from 'rate-limiter-flexible';

export const PAIR_FAILURES = 5;
export const ADDRESS_FAILURES = 50;
export const WINDOW_S = 15 * 60;
const TABLE = 'signin_limits';

interface Limiters {
  pair: RateLimiterSQLite;
  address: RateLimiterSQLite;
}

const byDb = new WeakMap<Knex, Limiters>();

function limiters(k: Knex): Limiters {
  let l = byDb.get(k);
  if (!l) {
    // The table is made by a migration (tableCreated): the limiter never issues DDL.
    const common = {
      storeClient: k,
      storeType: 'knex' as const,
      tableName: TABLE,
      tableCreated: true,
      duration: WINDOW_S,
      clearExpiredByTimeout: true,
    };
    l = {
      pair: new RateLimiterSQLite({ ...common, keyPrefix: 'pair', points: PAIR_FAILURES }),
      address: new RateLimiterSQLite({ ...common, keyPrefix: 'addr', points: ADDRESS_FAILURES }),
    };
    byDb.set(k, l);
  }
  return l;
}

const pairKey = (email: string, address: string) => `${email.trim().toLowerCase()}|${address}`;

function heldFor(res: RateLimiterRes | null, points: number): number {
  if (!res || res.consumedPoints < points) return 0;
  return Math.max(1, Math.ceil(res.msBeforeNext / 1000));
}

/** Seconds until a sign-in for this account from this address may be tried again; 0 = now. */
export async function signinHold(k: Knex, email: string, address: string): Promise<number> {
  const l = limiters(k);
  const [pair, addr] = await Promise.all([l.pair.get(pairKey(email, address)), l.address.get(address)]);
  return Math.max(heldFor(pair, PAIR_FAILURES), heldFor(addr, ADDRESS_FAILURES));
}

/** Counts one failed sign-in against the pair and the address. */
export async function recordSigninFailure(k: Knex, email: string, address: string): Promise<void> {
  const l = limiters(k);
  await l.pair.penalty(pairKey(email, address));
  await l.address.penalty(address);
}

/** A successful sign-in clears its own pair (not the address: one good account must not reset it). */
export async function recordSigninSuccess(k: Knex, email: string, address: string): Promise<void> {
  await limiters(k).pair.delete(pairKey(email, address));
}

/** Lifts every hold on this account, from any address (a director's action). Answers how many. */
export async function liftHolds(k: Knex, email: string): Promise<number> {
  const prefix = `pair:${email.trim().toLowerCase()}|`;
  // Escape LIKE's wildcards: an e-mail may contain '_' (and, rarely, '%').
  const pattern = prefix.replace(/[\\%_]/g, (c) => `\\${c}`) + '%';
  return k(TABLE).whereRaw("key LIKE ? ESCAPE '\\'", [pattern]).delete();
}

/**
 * The accounts held now, from any address, each with when its latest hold ends (epoch ms), by
 * e-mail: for the director's accounts screen. A hold is a pair that has used up its failures.
 */
export async function heldAccounts(k: Knex, now = Date.now()): Promise<Map<string, number>> {
  const rows = await k(TABLE)
    .where('key', 'like', 'pair:%')
    .where('points', '>=', PAIR_FAILURES)
    .where((q) => q.whereNull('expire').orWhere('expire', '>', now))
    .select('key', 'expire');
  const held = new Map<string, number>();
  for (const r of rows) {
    // pair:{email}|{address}: the address never holds a '|', so the last one ends the e-mail.
    const email = r.key.slice('pair:'.length, r.key.lastIndexOf('|'));
    const until = r.expire ?? now + WINDOW_S * 1000;
    held.set(email, Math.max(held.get(email) ?? 0, until));
  }
  return held;
}
