/** Turns an Auth.js session into the signed-in user, refusing ended, expired or deactivated ones. */
import type { Session } from '@auth/core/types';
import { db } from './db';
import { sessionUser } from './sessions';
import { toSessionUser } from './users';

export interface SignedIn {
  user: SessionUser;
  sessionId: string;
}

/** The session id the token carries, if it carries one. */
export function sessionIdOf(session: Session | null): string | null {
  const sid = (session?.user as { sid?: unknown } | undefined)?.sid;
  return typeof sid === 'string' && sid.length > 0 && sid.length <= 64 ? sid : null;
}

export async function userFromSession(session: Session | null): Promise<SignedIn | null> {
  const sessionId = sessionIdOf(session);
  if (!sessionId) return null;
  // A JWT cannot be revoked: the session row is what makes sign-out and deactivation stick.
  const row = await sessionUser(await db(), sessionId);
  if (!row || Number((session?.user as { id?: unknown }).id) !== row.id) return null;
  return { user: toSessionUser(row), sessionId };
}
