/** Turns an Auth.js session into the signed-in user, refusing ended or deactivated ones. */
import type { Session } from '@auth/core/types';
import { db } from './db';
import { findUserById, toSessionUser } from './users';

export async function userFromSession(session: Session | null): Promise<SessionUser | null> {
  const claims = session?.user as { id?: unknown; sv?: unknown } | undefined;
  const id = Number(claims?.id);
  if (!Number.isInteger(id) || id <= 0) return null;
  const row = await findUserById(await db(), id);
  // A JWT cannot be revoked: the session version makes sign-out and deactivation stick.
  if (!row || !row.active || row.session_version !== Number(claims?.sv)) return null;
  return toSessionUser(row);
}
