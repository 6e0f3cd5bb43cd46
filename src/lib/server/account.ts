/** A signed-in user's own account: changing the password. */
import type { Knex } from 'knex';
import { z } from 'zod';
import { audit } from './audit';
import { passwordProblem } from './password-policy';
import type { Answer } from './request-ids';
import { endAllSessions } from './sessions';
import { liftHolds, recordSigninFailure, signinHold } from './signin-limits';
import { checkPassword, findUserByEmail, findUserById, hashPassword } from './users';

export const passwordChangeSchema = z.object({
  id: z.string().trim().min(8, 'id must be a request id made by the page').max(64, 'id must be at most 64 characters'),
  currentPassword: z.string().min(1, 'Enter your current password.').max(200, 'Enter your current password.'),
  newPassword: z.string().max(1000, 'Use at most 200 characters.'),
});
export type PasswordChange = z.infer<typeof passwordChangeSchema>;

/**
 * Sets a new password when the current one is right. Every other session of the user ends
 * (a stolen session must not outlive the change); this one stays signed in.
 */
export async function changePassword(
  k: Knex,
  who: { userId: number; sessionId: string; address: string },
  input: PasswordChange,
): Promise<Answer> {
  const { userId, sessionId, address } = who;
  const user = await findUserById(k, userId);
  if (!user) return { status: 404, body: { error: 'No such account.' } };
  // The current password is guessed no faster here than at sign-in: the same limits apply.
  const wait = await signinHold(k, user.email, address);
  if (wait > 0)
    return { status: 429, body: { error: `Too many wrong passwords. Try again in ${Math.ceil(wait / 60)} minutes.` } };
  const problem = passwordProblem(input.newPassword);
  if (problem) return { status: 400, body: { error: problem, field: 'newPassword' } };
  if (!(await checkPassword(k, user.email, input.currentPassword))) {
    await recordSigninFailure(k, user.email, address);
    return { status: 400, body: { error: 'Your current password is not right.', field: 'currentPassword' } };
  }
  if (input.newPassword === input.currentPassword) {
    return { status: 400, body: { error: 'Choose a password other than your current one.', field: 'newPassword' } };
  }
  const passwordHash = await hashPassword(input.newPassword);
  const ended = await k.transaction(async (trx) => {
    await trx('users').where({ id: userId }).update({ password_hash: passwordHash });
    const n = await endAllSessions(trx, userId, 'password-changed', sessionId);
    await audit(trx, userId, 'user.password-changed', 'user', String(userId), { sessionsEnded: n });
    return n;
  });
  return { status: 200, body: { changed: true, otherSessionsEnded: ended } };
}

/**
 * Sets a user's password on someone else's word (a director, from the command line today; the
 * e-mailed reset later): every session of the account ends, its sign-in holds are lifted, and
 * the audit log says who did it. A deactivated account is refused.
 */
export async function setPasswordFor(
  k: Knex,
  email: string,
  newPassword: string,
  actorId: number | null,
): Promise<{ sessionsEnded: number; holdsLifted: number }> {
  const user = await findUserByEmail(k, email);
  if (!user) throw new Error(`there is no account for ${email.trim().toLowerCase()}`);
  if (!user.active) throw new Error(`the account for ${user.email} is deactivated; re-activate it first`);
  const problem = passwordProblem(newPassword);
  if (problem) throw new Error(problem);
  const passwordHash = await hashPassword(newPassword);
  const sessionsEnded = await k.transaction(async (trx) => {
    await trx('users').where({ id: user.id }).update({ password_hash: passwordHash });
    const n = await endAllSessions(trx, user.id, 'password-reset');
    await audit(trx, actorId, 'user.password-set', 'user', String(user.id), { sessionsEnded: n });
    return n;
  });
  const holdsLifted = await liftHolds(k, user.email);
  return { sessionsEnded, holdsLifted };
}
