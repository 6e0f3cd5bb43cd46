/**
 * Whether the installation is in demo mode: true while any active demo account exists.
 * Asked on every server-rendered page and by /api/me, so it is kept for a few seconds rather
 * than queried per request; `npm run demo:remove` (another process) shows within that time.
 */
import { db } from './db';
import { activeDemoAccounts } from './demo';

export const DEMO_MODE_TTL_MS = 3_000;

/**
 * `load`, run at most once per `ttlMs`; callers arriving during a load share it, and a
 * failed load is not kept (the next caller tries again).
 */
export function cachedFor<T>(ttlMs: number, load: () => Promise<T>, clock: () => number = Date.now): () => Promise<T> {
  let kept: { value: T; until: number } | null = null;
  let pending: Promise<T> | null = null;
  return () => {
    if (kept && clock() < kept.until) return Promise.resolve(kept.value);
    pending ??= load()
      .then((value) => {
        kept = { value, until: clock() + ttlMs };
        return value;
      })
      .finally(() => {
        pending = null;
      });
    return pending;
  };
}

/** True while any active demo account exists (kept for DEMO_MODE_TTL_MS). */
export const demoMode = cachedFor(DEMO_MODE_TTL_MS, async () => (await activeDemoAccounts(await db())) > 0);
