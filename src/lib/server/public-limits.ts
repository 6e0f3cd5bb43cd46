/**
 * Rate limits on the public account routes (docs/accounts.md, "Rate limits"), kept in SQLite
 * through rate-limiter-flexible as the sign-in limits are, in a table of their own
 * (`public_limits`) so that lifting a sign-in hold never touches them. Each route counts every
 * request per client address and per target (an e-mail address or a link's token hash), the
 * target counted whether or not it names anything, so a limit says nothing about accounts.
 */
import type { Knex } from 'knex';
import { RateLimiterSQLite, type RateLimiterRes } from 'rate-limiter-flexible';

export interface PublicLimit {
  /** Requests per client address in the window. */
  perAddress: number;
  /** Requests per target in the window. */
  perTarget: number;
  windowS: number;
}

/** The limits, by route. */
export const PUBLIC_LIMITS = {
  /** POST /api/password-resets; target: the e-mail. Past `perTarget` no further e-mail goes, the answer unchanged. */
  'reset-request': { perAddress: 20, perTarget: 3, windowS: 60 * 60 },
  /** POST /api/password-resets/{token}; target: the token. */
  'reset-confirm': { perAddress: 30, perTarget: 10, windowS: 15 * 60 },
  /** POST /api/invitations/{token}/accept; target: the token. */
  'invite-accept': { perAddress: 60, perTarget: 10, windowS: 15 * 60 },
  /** GET /invite/{token} and /reset-password/{token}; target: the token. */
  'token-page': { perAddress: 120, perTarget: 30, windowS: 15 * 60 },
} as const satisfies Record<string, PublicLimit>;

export type PublicRoute = keyof typeof PUBLIC_LIMITS;

const TABLE = 'public_limits';
const byDb = new WeakMap<Knex, Map<string, RateLimiterSQLite>>();

function limiter(k: Knex, route: PublicRoute, part: 'addr' | 'target'): RateLimiterSQLite {
  let all = byDb.get(k);
  if (!all) byDb.set(k, (all = new Map()));
  const key = `${route}:${part}`;
  let l = all.get(key);
  if (!l) {
    const limit: PublicLimit = PUBLIC_LIMITS[route];
    // The table is made by a migration (tableCreated): the limiter never issues DDL.
    l = new RateLimiterSQLite({
      storeClient: k,
      storeType: 'knex',
      tableName: TABLE,
      tableCreated: true,
      keyPrefix: key,
      points: part === 'addr' ? limit.perAddress : limit.perTarget,
      duration: limit.windowS,
      clearExpiredByTimeout: true,
    });
    all.set(key, l);
  }
  return l;
}

/** Seconds until the next try, from a refusal (`consume` rejects with a RateLimiterRes). */
function waitOf(res: unknown): number {
  const ms = (res as RateLimiterRes | undefined)?.msBeforeNext;
  if (typeof ms !== 'number') throw res; // a store fault, not a refusal
  return Math.max(1, Math.ceil(ms / 1000));
}

export interface Counted {
  /** Seconds to wait when the address is over its limit; 0 when it is not. */
  addressWait: number;
  /** Seconds to wait when the target is over its limit; 0 when it is not. */
  targetWait: number;
}

/**
 * Counts one request from `address` at `target`. The target is counted only when the address
 * was under its limit, so one address cannot use up someone else's target by hammering.
 */
export async function countRequest(k: Knex, route: PublicRoute, address: string, target: string): Promise<Counted> {
  try {
    await limiter(k, route, 'addr').consume(address);
  } catch (res) {
    return { addressWait: waitOf(res), targetWait: 0 };
  }
  try {
    await limiter(k, route, 'target').consume(target.trim().toLowerCase());
  } catch (res) {
    return { addressWait: 0, targetWait: waitOf(res) };
  }
  return { addressWait: 0, targetWait: 0 };
}

/** The answer to a request over a limit: 429 with Retry-After, the same for every target. */
export function tooMany(waitS: number): Response {
  const minutes = Math.max(1, Math.ceil(waitS / 60));
  return Response.json(
    { error: `Too many requests from here. Wait ${minutes} minute${minutes === 1 ? '' : 's'} and try again.` },
    { status: 429, headers: { 'Retry-After': String(waitS), 'Cache-Control': 'no-store' } },
  );
}
