/**
 * Sessions kept on the server. The session token (a JWT) carries only a random session id;
 * every request looks the session up, so sign-out, "sign out everywhere", deactivation and
 * password resets end sessions for good, which a JWT alone cannot do.
 */
import { randomBytes } from 'node:crypto';
import type { Knex } from 'knex';
import { audit } from './audit';
import { withStatements } from './prepared';
import type { UserRow } from './users';

/** How long a session lasts from sign-in (the token's own lifetime is the same). */
export const SESSION_MAX_AGE_S = 12 * 60 * 60;

export type EndedBy =
  | 'reactivated'
  | 'sign-out'
  | 'sign-out-everywhere'
  | 'deactivated'
  | 'password-changed'
  | 'password-reset'
  | 'role-changed';

/** Opens a session for the user and answers its id. */
export async function createSession(k: Knex, userId: number, now = new Date()): Promise<string> {
  const id = randomBytes(32).toString('base64url');
  await k('sessions').insert({
    id,
    user_id: userId,
    created_at: now.toISOString(),
    expires_at: new Date(now.getTime() + SESSION_MAX_AGE_S * 1000).toISOString(),
  });
  return id;
}

const SESSION_USER = `select users.* from sessions inner join users on users.id = sessions.user_id
  where sessions.id = ? and sessions.ended_at is null and sessions.expires_at > ? and users.active = 1 limit 1`;

/**
 * The active user of a live session, or undefined (ended, expired, unknown, or deactivated).
 * Asked on every request, so it is one prepared statement rather than a Knex query.
 */
export function sessionUser(k: Knex, sessionId: string, now = new Date()): Promise<UserRow | undefined> {
  return withStatements(k, (prepare) => prepare(SESSION_USER).get(sessionId, now.toISOString()) as UserRow | undefined);
}

/** Ends one session (this device's sign-out). */
export async function endSession(k: Knex, sessionId: string, by: EndedBy, now = new Date()): Promise<void> {
  await k('sessions')
    .where({ id: sessionId })
    .whereNull('ended_at')
    .update({ ended_at: now.toISOString(), ended_by: by });
}

/** Ends every session of the user, or every one but `keep` (a password change keeps its own). */
export async function endAllSessions(
  k: Knex,
  userId: number,
  by: EndedBy,
  keep?: string,
  now = new Date(),
): Promise<number> {
  const q = k('sessions').where({ user_id: userId }).whereNull('ended_at');
  if (keep) q.whereNot('id', keep);
  return q.update({ ended_at: now.toISOString(), ended_by: by });
}

/**
 * Deactivates or re-activates an account. Both ways end every session: re-activation must not
 * revive a session that was open when the account was deactivated.
 */
export async function setActive(k: Knex, userId: number, active: boolean, actorId: number | null): Promise<void> {
  await k.transaction(async (trx) => {
    const changed = await trx('users').where({ id: userId }).update({ active });
    if (changed === 0) throw new Error('no such account');
    await endAllSessions(trx, userId, active ? 'reactivated' : 'deactivated');
    await audit(trx, actorId, active ? 'user.reactivated' : 'user.deactivated', 'user', String(userId));
  });
}
