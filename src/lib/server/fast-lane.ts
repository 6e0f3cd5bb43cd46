/**
 * The fast lane: the one hot read of the API, `GET /api/canals/{id}`, answered straight from
 * the Node request when everything about it is ordinary, skipping Astro's request
 * conversion, static-file lookup, routing and `Response` (about three quarters of that
 * read's cost; docs/performance.md). It uses the same services as the route file
 * (src/pages/api/canals/[canalId].ts) and the middleware: the kept session, the session row
 * checked on every request, the same read access and the same stored canal. It answers only
 * a 200; anything else (no cookie, a session not yet decoded, a session ended, another
 * spelling of the path, a canal the user may not read) is handed to Astro, which answers as
 * it always has. The server entry (scripts/server.mjs) finds it through `FAST_LANE` once the
 * app has loaded; `FAST_LANE=0` turns it off.
 */
import type { IncomingMessage, ServerResponse } from 'node:http';
import { readableCase } from './access';
import { storedCanal } from './canal-store';
import { db } from './db';
import { userFromSession } from './session';
import { keptSessionOf } from './session-cache';

/** Where the server entry finds the lane (a global symbol: the entry is plain JavaScript). */
export const FAST_LANE = Symbol.for('coneline.fast-lane');

/** Only the canonical spelling; Astro's router takes every other one. */
const CANAL_PATH = /^\/api\/canals\/([0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})$/i;

/** Answers the request and returns true, or touches nothing and returns false. */
export async function answerFast(req: IncomingMessage, res: ServerResponse): Promise<boolean> {
  if (req.method !== 'GET') return false;
  const url = req.url ?? '';
  const canalId = CANAL_PATH.exec(url)?.[1];
  if (!canalId) return false;
  const session = keptSessionOf(String(req.headers.cookie ?? ''));
  if (!session) return false;
  const signedIn = await userFromSession(session);
  if (!signedIn) return false;
  const k = await db();
  const canal = await storedCanal(k, canalId);
  if (!canal || !(await readableCase(k, signedIn.user, canal.caseId))) return false;
  const body = JSON.stringify(canal);
  res.writeHead(200, {
    'Content-Type': 'application/json',
    'Cache-Control': 'no-store',
    'Content-Length': Buffer.byteLength(body),
    // Which lane answered, for whoever reads the network panel or a proxy's log.
    'Server-Timing': 'lane;desc="fast"',
  });
  res.end(body);
  return true;
}

/** Called once by the middleware's module: the server entry finds the lane from then on. */
export function offerFastLane(): void {
  if (process.env.FAST_LANE === '0') return;
  (globalThis as Record<symbol, unknown>)[FAST_LANE] = answerFast;
}
