/**
 * Accepting an invitation (docs/accounts.md): the person who holds the link chooses a name and a
 * password; the account (role, cohort, a student's attendings) is made in one transaction with
 * its audit lines. The link works once and for 7 days. Nobody is signed in: the page sends the
 * new user to the sign-in page.
 */
import type { Knex } from 'knex';
import type { InvitationStatus } from '../account-forms';
import { lookupHash } from './account-tokens';
import { audit } from './audit';
import { invitationStatus } from './invitations';
import { passwordProblem } from './password-policy';
import { bodyHash, type Answer } from './request-ids';
import { hashPassword } from './users';

const ROUTE = 'invitations.accept';

/** What the invitation page shows for a link. */
export type InvitationLink =
  | { status: 'unknown' }
  | {
      status: InvitationStatus;
      email: string;
      role: string;
      name: string | null;
      cohortName: string | null;
      expiresAt: string;
    };

/** The invitation a link's token names, as the page shows it, at `now`. */
export async function invitationForLink(k: Knex, token: string, now = new Date()): Promise<InvitationLink> {
  const row = await k('invitations')
    .where({ token_hash: lookupHash(token) })
    .first();
  if (!row) return { status: 'unknown' };
  const cohort = row.cohort_id === null ? undefined : await k('cohorts').where({ id: row.cohort_id }).first('name');
  return {
    status: invitationStatus(row, now),
    email: row.email,
    role: row.role,
    name: row.name,
    cohortName: cohort?.name ?? null,
    expiresAt: row.expires_at,
  };
}

export interface AcceptOptions {
  now?: Date;
  /** The password hasher (argon2id); tests count its calls. */
  hash?: (password: string) => Promise<string>;
}

/** Why an invitation link no longer works, in words for the person holding it. */
export const INVITATION_GONE: Record<Exclude<InvitationStatus, 'pending'>, string> = {
  accepted: 'This invitation was already used. Sign in with your e-mail and password.',
  expired: 'This invitation has expired (links last 7 days). Ask your course director to send it again.',
  revoked: 'This invitation was withdrawn. Ask your course director if you expected one.',
};

/**
 * Makes the account an invitation offers. The password is checked and hashed before the link
 * is looked up, so a dead link costs as much as a live one. 201 `{ email }`; 400 naming the
 * field; 404 for a link that names nothing; 410 once used, expired or revoked; 409 when the
 * address has an account by now. The same request id again answers the first answer.
 */
export async function acceptInvitation(
  k: Knex,
  token: string,
  input: { id: string; name: string; password: string },
  opts: AcceptOptions = {},
): Promise<Answer> {
  const now = opts.now ?? new Date();
  const problem = passwordProblem(input.password);
  if (problem) return { status: 400, body: { error: problem, field: 'password' } };
  const passwordHash = await (opts.hash ?? hashPassword)(input.password);
  const tokenHash = lookupHash(token);
  const requestHash = bodyHash(ROUTE, { token: tokenHash, name: input.name, password: input.password });

  return k.transaction(async (trx): Promise<Answer> => {
    const row = await trx('invitations').where({ token_hash: tokenHash }).first();
    if (!row) return { status: 404, body: { error: 'This invitation link is not valid. Check that it is complete.' } };
    const status = invitationStatus(row, now);
    if (status === 'accepted' && row.accepted_user_id !== null) {
      // A repeat of the request that accepted it (a double tap, a retry) gets its answer.
      const prior = await trx('request_ids').where({ user_id: row.accepted_user_id, id: input.id }).first();
      if (prior && prior.route === ROUTE && prior.body_hash === requestHash) {
        return { status: prior.status, body: JSON.parse(prior.answer_json) as Record<string, unknown> };
      }
    }
    if (status !== 'pending') return { status: 410, body: { error: INVITATION_GONE[status], reason: status } };
    if (await trx('users').where({ email: row.email }).first('id')) {
      return {
        status: 409,
        body: { error: `An account for ${row.email} already exists. Sign in, or use “Forgot your password?”.` },
      };
    }

    const at = now.toISOString();
    const [created] = await trx('users')
      .insert({
        email: row.email,
        name: input.name,
        role: row.role,
        password_hash: passwordHash,
        cohort_id: row.cohort_id,
      })
      .returning('id');
    const userId = created!.id;
    const attendings = row.role === 'student' ? await stillAttendings(trx, row.attending_ids_json) : [];
    for (const attendingId of attendings) {
      await trx('assignments').insert({ attending_id: attendingId, student_id: userId });
    }
    await trx('invitations').where({ id: row.id }).update({ accepted_at: at, accepted_user_id: userId });
    await audit(trx, userId, 'user.created', 'user', String(userId), { role: row.role, invitationId: row.id });
    await audit(trx, userId, 'invitation.accepted', 'invitation', String(row.id), {
      cohortId: row.cohort_id,
      attendingIds: attendings,
    });
    const answer: Answer = { status: 201, body: { accepted: true, email: row.email, signIn: '/signin?code=welcome' } };
    await trx('request_ids').insert({
      id: input.id,
      user_id: userId,
      route: ROUTE,
      body_hash: requestHash,
      status: answer.status,
      answer_json: JSON.stringify(answer.body),
      at,
    });
    return answer;
  });
}

/** The invitation's attendings who are still active attendings (one deactivated since is left out). */
async function stillAttendings(trx: Knex, json: string | null): Promise<number[]> {
  let ids: unknown;
  try {
    ids = JSON.parse(json ?? '[]');
  } catch {
    return [];
  }
  if (!Array.isArray(ids) || ids.length === 0) return [];
  return trx('users')
    .whereIn(
      'id',
      ids.filter((n): n is number => Number.isInteger(n)),
    )
    .where({ role: 'attending', active: true })
    .pluck('id');
}
