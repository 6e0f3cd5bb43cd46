/**
 * Decoding the Auth.js session token (a JWE) costs about 3 ms a request; the tablet's sync
 * sends many requests with the same token. Decoded sessions are kept briefly by token.
 * Revocation is unaffected: every request still checks the user's active flag and session
 * version in the database (session.ts).
 */
import type { Session } from '@auth/core/types';
import { getSession } from 'auth-astro/server';

const KEEP_MS = 60_000;
const MAX_ENTRIES = 1000;
const cache = new Map<string, { session: Session | null; until: number }>();
const TOKEN = /(?:^|;\s*)(?:__Secure-)?authjs\.session-token=([^;]+)/;

export async function sessionOf(request: Request, now = Date.now()): Promise<Session | null> {
  const cookie = request.headers.get('cookie') ?? '';
  if (!cookie.includes('authjs.session-token')) return null; // no session cookie at all
  const token = TOKEN.exec(cookie)?.[1];
  // A token split over several cookies (very large sessions) is decoded every time.
  if (!token) return getSession(request);
  const hit = cache.get(token);
  if (hit && hit.until > now) return hit.session;
  const session = await getSession(request);
  const expires = session?.expires ? Date.parse(session.expires) : now;
  cache.set(token, { session, until: Math.min(now + KEEP_MS, expires) });
  if (cache.size > MAX_ENTRIES) cache.delete(cache.keys().next().value!);
  return session;
}

/**
 * The session a cookie header decodes to, only when it is already kept (decoded by an
 * earlier request within KEEP_MS); `undefined` when it would have to be decoded now.
 */
export function keptSessionOf(cookie: string, now = Date.now()): Session | null | undefined {
  if (!cookie.includes('authjs.session-token')) return undefined;
  const token = TOKEN.exec(cookie)?.[1];
  if (!token) return undefined;
  const hit = cache.get(token);
  return hit && hit.until > now ? hit.session : undefined;
}
