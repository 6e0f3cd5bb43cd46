/**
 * Password resets by e-mail (docs/accounts.md). Anyone may ask for a link for an address; the
 * answer is the same 202 whether or not it names an account, and comes before the address is
 * even looked up (the work is done after answering), so neither the words nor the time say
 * whether an account exists. A link goes only to an active account, lasts 1 hour, works once,
 * and replaces any earlier one. Setting the password ends every session of the account, lifts
 * its sign-in holds and signs nobody in. A director may send a user the same link.
 */
import type { Knex } from 'knex';
import { composeReset } from './account-mail';
import { lookupHash, newToken } from './account-tokens';
import { audit } from './audit';
import { config } from './config';
import { enqueueDirectMail } from './mail-outbox';
import { kickMail } from './mail-worker';
import { passwordProblem } from './password-policy';
import { countRequest, tooMany } from './public-limits';
import { bodyHash, type Answer } from './request-ids';
import { endAllSessions } from './sessions';
import { liftHolds } from './signin-limits';
import type { PasswordResetRow, UserRow } from './tables';
import { findUserByEmail, hashPassword } from './users';

/** How long a reset link works. */
export const RESET_TTL_MS = 60 * 60 * 1000;

const REQUEST_ROUTE = 'password-resets.request';
const CONFIRM_ROUTE = 'password-resets.confirm';

/** The one answer to every reset request that is not over the address's limit. */
export const RESET_REQUESTED = {
  status: 202,
  body: {
    accepted: true,
    message:
      'If an active account uses that address, a link to set a new password is on its way. It works once, for 1 hour.',
  },
} as const satisfies Answer;

/** Writes a new link for `user` (earlier unused ones stop working) and its e-mail, inside `trx`. */
async function issueLink(
  trx: Knex,
  user: Pick<UserRow, 'id' | 'email'>,
  requestedBy: number | null,
  token: { token: string; hash: string },
  now: Date,
): Promise<string> {
  const at = now.toISOString();
  const expiresAt = new Date(now.getTime() + RESET_TTL_MS).toISOString();
  await trx('password_resets')
    .where({ user_id: user.id })
    .whereNull('used_at')
    .whereNull('superseded_at')
    .update({ superseded_at: at });
  await trx('password_resets').insert({
    user_id: user.id,
    token_hash: token.hash,
    expires_at: expiresAt,
    requested_by: requestedBy,
    created_at: at,
  });
  const { publicUrl, clinic } = config();
  const mail = composeReset({
    link: `${publicUrl}/reset-password/${token.token}`,
    expiresAt,
    clinic,
    byDirector: requestedBy !== null,
  });
  await enqueueDirectMail(trx, { recipientId: user.id, to: user.email, kind: 'password-reset', ...mail }, at);
  return expiresAt;
}

/**
 * The work behind a reset request, done after the answer has gone: a link for an active
 * account, once per request id. A token is made and hashed whether or not the address names
 * an account, so both take the same work. Answers whether an e-mail was written.
 */
export async function requestReset(k: Knex, input: { id: string; email: string }, now = new Date()): Promise<boolean> {
  const token = newToken();
  const user = await findUserByEmail(k, input.email);
  if (!user || !user.active) return false;
  const requestHash = bodyHash(REQUEST_ROUTE, input);
  const written = await k.transaction(async (trx) => {
    if (await trx('request_ids').where({ user_id: user.id, id: input.id }).first('id')) return false;
    await issueLink(trx, user, null, token, now);
    await audit(trx, null, 'user.password-reset-requested', 'user', String(user.id));
    await trx('request_ids').insert({
      id: input.id,
      user_id: user.id,
      route: REQUEST_ROUTE,
      body_hash: requestHash,
      status: RESET_REQUESTED.status,
      answer_json: JSON.stringify(RESET_REQUESTED.body),
      at: now.toISOString(),
    });
    return true;
  });
  if (written) kickMail();
  return written;
}

/**
 * POST /api/password-resets: counts the request against the address and the e-mail, answers,
 * and only then looks the address up (requestReset). 429 only when the client's address is
 * over its limit; past the e-mail's own limit the answer is the same and no e-mail goes.
 */
export async function acceptResetRequest(
  k: Knex,
  input: { id: string; email: string },
  address: string,
): Promise<Answer | Response> {
  const counted = await countRequest(k, 'reset-request', address, input.email);
  if (counted.addressWait > 0) return tooMany(counted.addressWait);
  if (counted.targetWait === 0) {
    setImmediate(() => {
      requestReset(k, input).catch((err: unknown) => {
        console.error(`[password-reset] a reset e-mail could not be written: ${(err as Error)?.name ?? 'Error'}`);
      });
    });
  }
  return RESET_REQUESTED;
}

/**
 * A director sends `userId` a reset link (docs/accounts.md). 404 for no such account; 409 for
 * a deactivated one (re-activate it first); 202 with when the link stops working.
 */
export async function sendResetFor(k: Knex, directorId: number, userId: number, now = new Date()): Promise<Answer> {
  const answer = await k.transaction(async (trx): Promise<Answer> => {
    const user = await trx('users').where({ id: userId }).first();
    if (!user) return { status: 404, body: { error: 'There is no such account.' } };
    if (!user.active) {
      return {
        status: 409,
        body: { error: `The account of ${user.name} is deactivated; re-activate it before sending a reset link.` },
      };
    }
    const expiresAt = await issueLink(trx, user, directorId, newToken(), now);
    await audit(trx, directorId, 'user.password-reset-sent', 'user', String(user.id));
    return { status: 202, body: { sent: true, email: user.email, expiresAt } };
  });
  if (answer.status === 202) kickMail();
  return answer;
}

export type ResetLinkStatus = 'usable' | 'unknown' | 'used' | 'superseded' | 'expired' | 'deactivated';

function linkStatus(row: PasswordResetRow | undefined, active: boolean, now: Date): ResetLinkStatus {
  if (!row) return 'unknown';
  if (row.used_at) return 'used';
  if (row.superseded_at) return 'superseded';
  if (Date.parse(row.expires_at) <= now.getTime()) return 'expired';
  return active ? 'usable' : 'deactivated';
}

/** What the reset page shows for a link: whether it works, and until when. */
export async function resetForLink(
  k: Knex,
  token: string,
  now = new Date(),
): Promise<{ status: ResetLinkStatus; expiresAt?: string }> {
  const row = await k('password_resets')
    .where({ token_hash: lookupHash(token) })
    .first();
  const user = row ? await k('users').where({ id: row.user_id }).first('active') : undefined;
  const status = linkStatus(row, Boolean(user?.active), now);
  return status === 'usable' ? { status, expiresAt: row!.expires_at } : { status };
}

/** Why a link cannot be used, in words for the person holding it. */
export const RESET_REFUSAL: Record<Exclude<ResetLinkStatus, 'usable'>, { status: 404 | 409 | 410; error: string }> = {
  unknown: { status: 404, error: 'This reset link is not valid. Check that it is complete, or ask for a new one.' },
  used: { status: 410, error: 'This reset link was already used. Sign in, or ask for a new link.' },
  superseded: { status: 410, error: 'A newer reset link was sent since: use the latest e-mail.' },
  expired: { status: 410, error: 'This reset link has expired (links last 1 hour). Ask for a new one.' },
  deactivated: {
    status: 409,
    error: 'This account is deactivated, so its password cannot be set. Ask your course director.',
  },
};

/**
 * Sets the password a reset link is for: the password is checked and hashed before the link
 * is looked up; then, in one transaction, the password is set, the link used (and any other
 * left unused ended), every session of the account ended, its sign-in holds lifted and an
 * audit line written. Nobody is signed in. The same request id again answers the first answer.
 */
export async function confirmReset(
  k: Knex,
  token: string,
  input: { id: string; password: string },
  opts: { now?: Date; hash?: (password: string) => Promise<string> } = {},
): Promise<Answer> {
  const now = opts.now ?? new Date();
  const problem = passwordProblem(input.password);
  if (problem) return { status: 400, body: { error: problem, field: 'password' } };
  const passwordHash = await (opts.hash ?? hashPassword)(input.password);
  const tokenHash = lookupHash(token);
  const requestHash = bodyHash(CONFIRM_ROUTE, { token: tokenHash, password: input.password });

  return k.transaction(async (trx): Promise<Answer> => {
    const row = await trx('password_resets').where({ token_hash: tokenHash }).first();
    const user = row ? await trx('users').where({ id: row.user_id }).first() : undefined;
    if (row?.used_at && user) {
      const prior = await trx('request_ids').where({ user_id: user.id, id: input.id }).first();
      if (prior && prior.route === CONFIRM_ROUTE && prior.body_hash === requestHash) {
        return { status: prior.status, body: JSON.parse(prior.answer_json) as Record<string, unknown> };
      }
    }
    const status = linkStatus(row, Boolean(user?.active), now);
    if (status !== 'usable' || !row || !user) {
      const refusal = RESET_REFUSAL[status === 'usable' ? 'unknown' : status];
      return { status: refusal.status, body: { error: refusal.error, reason: status } };
    }
    const at = now.toISOString();
    await trx('users').where({ id: user.id }).update({ password_hash: passwordHash });
    await trx('password_resets').where({ id: row.id }).update({ used_at: at });
    await trx('password_resets')
      .where({ user_id: user.id })
      .whereNull('used_at')
      .whereNull('superseded_at')
      .update({ superseded_at: at });
    const sessionsEnded = await endAllSessions(trx, user.id, 'password-reset', undefined, now);
    const holdsLifted = await liftHolds(trx, user.email);
    await audit(trx, user.id, 'user.password-reset', 'user', String(user.id), {
      sessionsEnded,
      holdsLifted,
      sentByDirector: row.requested_by !== null,
    });
    const answer: Answer = { status: 200, body: { reset: true, signIn: '/signin?code=password-set' } };
    await trx('request_ids').insert({
      id: input.id,
      user_id: user.id,
      route: CONFIRM_ROUTE,
      body_hash: requestHash,
      status: answer.status,
      answer_json: JSON.stringify(answer.body),
      at,
    });
    return answer;
  });
}
