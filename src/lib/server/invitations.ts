/**
 * Invitations, the director's side (docs/accounts.md): invite one address, list, resend (a new
 * token; the old link stops working) and revoke. Accepting is in invitation-accept.ts, a CSV of
 * a cohort in invitation-csv.ts. Every write is one transaction with its audit line and, when
 * it sends a link, its e-mail in the outbox. Callers have checked that the actor is a director.
 */
import type { Knex } from 'knex';
import type { Invite, InvitationStatus, InvitationView } from '../account-forms';
import { composeInvitation } from './account-mail';
import { newToken } from './account-tokens';
import { audit } from './audit';
import { config } from './config';
import { enqueueDirectMail } from './mail-outbox';
import { kickMail } from './mail-worker';
import type { Answer } from './request-ids';
import type { InvitationRow } from './tables';

/** How long an invitation link works. */
export const INVITATION_TTL_MS = 7 * 24 * 60 * 60 * 1000;

/** What an invitation is at `now`. */
export function invitationStatus(row: InvitationRow, now: Date): InvitationStatus {
  if (row.accepted_at) return 'accepted';
  if (row.revoked_at) return 'revoked';
  return Date.parse(row.expires_at) <= now.getTime() ? 'expired' : 'pending';
}

interface Director {
  id: number;
  name: string;
}

function attendingIdsOf(row: InvitationRow): number[] {
  try {
    const ids = JSON.parse(row.attending_ids_json ?? '[]') as unknown;
    return Array.isArray(ids) ? ids.filter((n): n is number => Number.isInteger(n)) : [];
  } catch {
    return [];
  }
}

async function view(k: Knex, row: InvitationRow, now: Date): Promise<InvitationView> {
  const [cohort, inviter] = await Promise.all([
    row.cohort_id === null ? undefined : k('cohorts').where({ id: row.cohort_id }).first('name'),
    k('users').where({ id: row.invited_by }).first('name'),
  ]);
  return {
    invitationId: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    cohortId: row.cohort_id,
    cohortName: cohort?.name ?? null,
    attendingIds: attendingIdsOf(row),
    status: invitationStatus(row, now),
    invitedBy: inviter?.name ?? '',
    createdAt: row.created_at,
    expiresAt: row.expires_at,
    acceptedAt: row.accepted_at,
    revokedAt: row.revoked_at,
    sentCount: row.sent_count,
  };
}

/** Every invitation, newest first, with its status at `now`. */
export async function listInvitations(k: Knex, now = new Date()): Promise<InvitationView[]> {
  const rows = await k('invitations').orderBy('id', 'desc').limit(1000);
  return Promise.all(rows.map((r) => view(k, r, now)));
}

/** Writes the invitation e-mail for `token` to the outbox, inside the caller's transaction. */
async function mailLink(
  trx: Knex,
  inviter: Director,
  row: Pick<InvitationRow, 'email' | 'role' | 'expires_at'>,
  token: string,
  at: string,
) {
  const { publicUrl, clinic } = config();
  const mail = composeInvitation({
    inviterName: inviter.name,
    role: row.role,
    link: `${publicUrl}/invite/${token}`,
    expiresAt: row.expires_at,
    clinic,
  });
  await enqueueDirectMail(trx, { recipientId: null, to: row.email, kind: 'invitation', ...mail }, at);
}

const refused = (status: number, error: string, extra: Record<string, unknown> = {}): Answer => ({
  status,
  body: { error, ...extra },
});

/** Checks the cohort and attendings an invitation names; null when they are fine. */
async function badReferences(k: Knex, input: Pick<Invite, 'cohortId' | 'attendingIds'>): Promise<Answer | null> {
  if (input.cohortId != null && !(await k('cohorts').where({ id: input.cohortId }).first('id'))) {
    return refused(400, 'There is no such cohort.', { field: 'cohortId' });
  }
  const wanted = [...new Set(input.attendingIds ?? [])];
  if (wanted.length > 0) {
    const found = await k('users').whereIn('id', wanted).where({ role: 'attending', active: true }).pluck('id');
    if (found.length !== wanted.length) {
      return refused(400, 'Each attending must be an active attending’s account.', { field: 'attendingIds' });
    }
  }
  return null;
}

/**
 * Invites `input.email` (docs/accounts.md): 409 when the address has an account (active or
 * not) or an invitation still pending (resend or revoke that one instead); else the
 * invitation, its e-mail and its audit line are written together. Answers 201.
 */
export async function createInvitation(k: Knex, inviter: Director, input: Invite, now = new Date()): Promise<Answer> {
  const bad = await badReferences(k, input);
  if (bad) return bad;
  const at = now.toISOString();
  const answer = await k.transaction(async (trx): Promise<Answer> => {
    const user = await trx('users').where({ email: input.email }).first('id', 'active');
    if (user) {
      const how = user.active ? '' : ' (deactivated: re-activate it instead)';
      return refused(409, `An account for ${input.email} already exists${how}.`, {
        field: 'email',
        reason: 'has-account',
      });
    }
    const pending = await trx('invitations')
      .where({ email: input.email })
      .whereNull('accepted_at')
      .whereNull('revoked_at')
      .where('expires_at', '>', at)
      .first('id');
    if (pending) {
      return refused(409, `An invitation to ${input.email} is still pending: resend or revoke it instead.`, {
        field: 'email',
        reason: 'already-invited',
        invitationId: pending.id,
      });
    }
    const { token, hash } = newToken();
    const row = {
      email: input.email,
      name: input.name ?? null,
      role: input.role,
      cohort_id: input.cohortId ?? null,
      attending_ids_json: input.role === 'student' ? JSON.stringify([...new Set(input.attendingIds ?? [])]) : null,
      token_hash: hash,
      invited_by: inviter.id,
      expires_at: new Date(now.getTime() + INVITATION_TTL_MS).toISOString(),
      created_at: at,
      last_sent_at: at,
      sent_count: 1,
    };
    const [inserted] = await trx('invitations').insert(row).returning('id');
    const id = inserted!.id;
    await mailLink(trx, inviter, row, token, at);
    await audit(trx, inviter.id, 'invitation.created', 'invitation', String(id), {
      role: row.role,
      cohortId: row.cohort_id,
    });
    const stored = await trx('invitations').where({ id }).first();
    return { status: 201, body: { invitation: await view(trx, stored!, now) } };
  });
  if (answer.status === 201) kickMail();
  return answer;
}

const noSuchInvitation = (): Answer => refused(404, 'There is no such invitation.');

/**
 * Sends a pending or expired invitation again with a new token: the old link stops working,
 * the new one works 7 days from now. 409 once accepted or revoked, or when the address has
 * an account by now.
 */
export async function resendInvitation(
  k: Knex,
  inviter: Director,
  invitationId: number,
  now = new Date(),
): Promise<Answer> {
  const at = now.toISOString();
  const answer = await k.transaction(async (trx): Promise<Answer> => {
    const row = await trx('invitations').where({ id: invitationId }).first();
    if (!row) return noSuchInvitation();
    const status = invitationStatus(row, now);
    if (status === 'accepted') return refused(409, 'This invitation was already accepted.');
    if (status === 'revoked') return refused(409, 'This invitation was revoked; invite the address again instead.');
    if (await trx('users').where({ email: row.email }).first('id')) {
      return refused(409, `An account for ${row.email} already exists.`, { reason: 'has-account' });
    }
    const { token, hash } = newToken();
    const expires_at = new Date(now.getTime() + INVITATION_TTL_MS).toISOString();
    await trx('invitations')
      .where({ id: row.id })
      .update({ token_hash: hash, expires_at, last_sent_at: at, sent_count: row.sent_count + 1 });
    await mailLink(trx, inviter, { ...row, expires_at }, token, at);
    await audit(trx, inviter.id, 'invitation.resent', 'invitation', String(row.id));
    const stored = await trx('invitations').where({ id: row.id }).first();
    return { status: 200, body: { invitation: await view(trx, stored!, now) } };
  });
  if (answer.status === 200) kickMail();
  return answer;
}

/** Revokes an invitation that is not accepted: its link stops working. Revoking twice is the same as once. */
export async function revokeInvitation(
  k: Knex,
  director: Director,
  invitationId: number,
  now = new Date(),
): Promise<Answer> {
  return k.transaction(async (trx): Promise<Answer> => {
    const row = await trx('invitations').where({ id: invitationId }).first();
    if (!row) return noSuchInvitation();
    if (row.accepted_at) return refused(409, 'This invitation was already accepted; the account exists.');
    if (!row.revoked_at) {
      await trx('invitations').where({ id: row.id }).update({ revoked_at: now.toISOString(), revoked_by: director.id });
      await audit(trx, director.id, 'invitation.revoked', 'invitation', String(row.id));
    }
    const stored = await trx('invitations').where({ id: row.id }).first();
    return { status: 200, body: { invitation: await view(trx, stored!, now) } };
  });
}

/** What the director's invitations page needs: cohorts, active attendings and the list. */
export async function invitationsPageData(
  k: Knex,
  now = new Date(),
): Promise<{
  cohorts: { id: number; name: string }[];
  attendings: { id: number; name: string }[];
  invitations: InvitationView[];
}> {
  const [cohorts, attendings, invitations] = await Promise.all([
    k('cohorts').orderBy('name').select('id', 'name'),
    k('users').where({ role: 'attending', active: true }).orderBy('name').select('id', 'name'),
    listInvitations(k, now),
  ]);
  return { cohorts, attendings, invitations };
}
