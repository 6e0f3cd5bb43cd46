import type { APIRoute } from 'astro';
import { db } from '../../lib/server/db';
import { json } from '../../lib/server/http';

/**
 * Whether the server can serve: the database is open, migrated, and this process holds the
 * data folder. The server entry asks it once at start-up (so a busy or broken database stops
 * the start instead of the first user's request), and a school's monitor may ask it too.
 * It answers nothing about anyone.
 */
export const GET: APIRoute = async () => {
  try {
    await (await db()).raw('select 1');
    return json({ ok: true });
  } catch (err) {
    // The cause is for the operator's log only (paths, not people); the answer stays bare.
    console.error(`[health] the database is not ready: ${(err as Error).message}`);
    return json({ ok: false }, 503);
  }
};
