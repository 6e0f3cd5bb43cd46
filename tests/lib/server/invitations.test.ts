// Invitations in-process (docs/accounts.md) with an injected clock: a link works once and for
// 7 days, the token is stored only as its hash, the account is made with its role, cohort and
// attendings, and a CSV of a small invented cohort is invited row by row.
import { randomUUID } from 'node:crypto';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tokenHash } from '../../../src/lib/server/account-tokens';
import { acceptInvitation, invitationForLink } from '../../../src/lib/server/invitation-accept';
import { inviteFromCsv, parseInviteCsv, rowRequestId } from '../../../src/lib/server/invitation-csv';
import {
  createInvitation,
  INVITATION_TTL_MS,
  resendInvitation,
  revokeInvitation,
} from '../../../src/lib/server/invitations';
import { deliverDue } from '../../../src/lib/server/mail-outbox';
import { syncDb, type SyncDb } from '../../helpers/sync-db';

const PUBLIC_URL = 'https://coneline.school.example';
let db: SyncDb;
let director: { id: number; name: string };
let attending: number;
let retired: number;
let cohort: number;
const T0 = new Date('2026-12-07T09:00:00.000Z');
const at = (ms: number) => new Date(T0.getTime() + ms);
const PASSWORD = 'lateral compaction 2026';

beforeAll(async () => {
  Object.assign(process.env, {
    PUBLIC_URL,
    AUTH_SECRET: 'unit-test-secret-unit-test-secret-0123456789',
    DATA_DIR: mkdtempSync(join(tmpdir(), 'coneline-invite-')),
  });
  db = await syncDb();
  const add = async (email: string, name: string, role: Role, active = true) => {
    const [row] = await db.k('users').insert({ email, name, role, active }).returning('id');
    return row!.id;
  };
  director = { id: await add('head@school.example', 'Dr Wren Adeyemi', 'director'), name: 'Dr Wren Adeyemi' };
  attending = await add('tutor@school.example', 'Dr Otto Brandt', 'attending');
  retired = await add('retired@school.example', 'Dr Ada Old', 'attending', false);
  const [c] = await db.k('cohorts').insert({ name: 'Class of 2028', graduation_year: 2028 }).returning('id');
  cohort = c!.id;
});
afterAll(async () => {
  await db.close();
});

/** The token in the newest invitation e-mail to `email`. */
async function linkTo(email: string): Promise<string> {
  const mail = await db
    .k('mail_outbox')
    .where({ to_address: email, kind: 'invitation' })
    .orderBy('created_at', 'desc')
    .first();
  const m = /\/invite\/([A-Za-z0-9_-]{43})/.exec(mail!.body_text);
  return m![1]!;
}

const invite = (email: string, extra: Record<string, unknown> = {}, now = T0) =>
  createInvitation(db.k, director, { id: randomUUID(), email, role: 'student', cohortId: cohort, ...extra }, now);

const counting = () => {
  const calls: string[] = [];
  return { calls, hash: async (p: string) => (calls.push(p), `hashed:${p}`) };
};

describe('createInvitation', () => {
  it('stores the token only as its SHA-256 and e-mails the link in the same transaction', async () => {
    const answer = await invite('rowan.finch@school.example', { attendingIds: [attending], name: 'Rowan Finch' });
    expect(answer.status).toBe(201);
    const row = await db.k('invitations').where({ email: 'rowan.finch@school.example' }).first();
    const token = await linkTo('rowan.finch@school.example');
    expect(row!.token_hash).toBe(tokenHash(token));
    expect(JSON.stringify(row)).not.toContain(token);
    const mail = await db.k('mail_outbox').where({ to_address: 'rowan.finch@school.example' }).first();
    expect(mail).toMatchObject({ recipient_id: null, status: 'pending', kind: 'invitation' });
    expect(mail!.body_text).toContain(`${PUBLIC_URL}/invite/${token}`);
    expect(mail!.body_text).toContain('Dr Wren Adeyemi invited you');
    expect(row!.expires_at).toBe(at(INVITATION_TTL_MS).toISOString());
    const audit = await db
      .k('audit_log')
      .where({ action: 'invitation.created', subject_id: String(row!.id) })
      .first();
    expect(audit?.actor_id).toBe(director.id);
  });

  it('answers 409 for an address that has an account, active or not', async () => {
    for (const email of ['tutor@school.example', 'retired@school.example']) {
      const answer = await invite(email, { role: 'attending' });
      expect(answer.status).toBe(409);
      expect(answer.body).toMatchObject({ field: 'email', reason: 'has-account' });
    }
  });

  it('refuses a second invitation while one is pending, and allows one once it has expired', async () => {
    expect((await invite('kit.moss@school.example')).status).toBe(201);
    const again = await invite('kit.moss@school.example', {}, at(INVITATION_TTL_MS - 1));
    expect(again).toMatchObject({ status: 409, body: { reason: 'already-invited' } });
    expect((await invite('kit.moss@school.example', {}, at(INVITATION_TTL_MS))).status).toBe(201);
  });

  it('refuses attendings who are not active attendings and a cohort that does not exist', async () => {
    expect(await invite('a1@school.example', { attendingIds: [retired] })).toMatchObject({
      status: 400,
      body: { field: 'attendingIds' },
    });
    expect(await invite('a2@school.example', { attendingIds: [director.id] })).toMatchObject({ status: 400 });
    expect(await invite('a3@school.example', { cohortId: 99999 })).toMatchObject({
      status: 400,
      body: { field: 'cohortId' },
    });
    expect(await db.k('invitations').whereIn('email', ['a1@school.example', 'a3@school.example'])).toEqual([]);
  });
});

describe('acceptInvitation', () => {
  it('makes the account with its role, cohort and attendings, once, with audit lines', async () => {
    await invite('ines.ward@school.example', { attendingIds: [attending] });
    const token = await linkTo('ines.ward@school.example');
    const id = randomUUID();
    const first = await acceptInvitation(db.k, token, { id, name: 'Ines Ward', password: PASSWORD }, { now: at(1000) });
    expect(first).toMatchObject({ status: 201, body: { email: 'ines.ward@school.example' } });
    const user = await db.k('users').where({ email: 'ines.ward@school.example' }).first();
    expect(user).toMatchObject({ name: 'Ines Ward', role: 'student', cohort_id: cohort });
    expect(await db.k('assignments').where({ student_id: user!.id }).pluck('attending_id')).toEqual([attending]);
    const actions = await db.k('audit_log').where({ actor_id: user!.id }).pluck('action');
    expect(actions).toEqual(expect.arrayContaining(['user.created', 'invitation.accepted']));

    // The same request again (a double tap) gets the first answer; another is refused.
    expect(await acceptInvitation(db.k, token, { id, name: 'Ines Ward', password: PASSWORD })).toEqual(first);
    const second = await acceptInvitation(db.k, token, { id: randomUUID(), name: 'Someone Else', password: PASSWORD });
    expect(second).toMatchObject({ status: 410, body: { reason: 'accepted' } });
    expect(await db.k('users').where({ email: 'ines.ward@school.example' })).toHaveLength(1);
  });

  it('works until 7 days have passed and is refused from then on', async () => {
    await invite('late.lark@school.example');
    const token = await linkTo('late.lark@school.example');
    const late = await acceptInvitation(
      db.k,
      token,
      { id: randomUUID(), name: 'Late Lark', password: PASSWORD },
      { now: at(INVITATION_TTL_MS) },
    );
    expect(late).toMatchObject({ status: 410, body: { reason: 'expired' } });
    expect((await invitationForLink(db.k, token, at(INVITATION_TTL_MS))).status).toBe('expired');
    expect((await invitationForLink(db.k, token, at(INVITATION_TTL_MS - 1))).status).toBe('pending');
    const justInTime = await acceptInvitation(
      db.k,
      token,
      { id: randomUUID(), name: 'Late Lark', password: PASSWORD },
      { now: at(INVITATION_TTL_MS - 1) },
    );
    expect(justInTime.status).toBe(201);
  });

  it('hashes the password whether the link is live or names nothing', async () => {
    await invite('hash.both@school.example');
    const token = await linkTo('hash.both@school.example');
    const live = counting();
    const dead = counting();
    const input = { name: 'Hash Both', password: PASSWORD };
    const unknown = await acceptInvitation(db.k, 'x'.repeat(43), { id: randomUUID(), ...input }, { hash: dead.hash });
    const made = await acceptInvitation(db.k, token, { id: randomUUID(), ...input }, { hash: live.hash });
    expect([unknown.status, made.status]).toEqual([404, 201]);
    expect(dead.calls).toEqual([PASSWORD]);
    expect(live.calls).toEqual([PASSWORD]);
  });

  it('refuses a password on the common list naming the field, before anything is stored', async () => {
    await invite('weak.pw@school.example');
    const token = await linkTo('weak.pw@school.example');
    const answer = await acceptInvitation(db.k, token, { id: randomUUID(), name: 'Weak', password: 'password1234' });
    expect(answer).toMatchObject({ status: 400, body: { field: 'password' } });
    expect(await db.k('users').where({ email: 'weak.pw@school.example' })).toEqual([]);
  });
});

describe('resendInvitation and revokeInvitation', () => {
  it('kills the old link on a resend and the new one on a revoke', async () => {
    const made = await invite('twice.sent@school.example');
    const invitationId = (made.body.invitation as { invitationId: number }).invitationId;
    const old = await linkTo('twice.sent@school.example');
    expect((await resendInvitation(db.k, director, invitationId, at(60_000))).status).toBe(200);
    const fresh = await linkTo('twice.sent@school.example');
    expect(fresh).not.toBe(old);
    expect((await invitationForLink(db.k, old, at(60_000))).status).toBe('unknown');
    expect((await invitationForLink(db.k, fresh, at(60_000))).status).toBe('pending');
    expect((await db.k('invitations').where({ id: invitationId }).first())!.sent_count).toBe(2);

    expect((await revokeInvitation(db.k, director, invitationId, at(120_000))).status).toBe(200);
    const accepted = await acceptInvitation(db.k, fresh, { id: randomUUID(), name: 'Twice', password: PASSWORD });
    expect(accepted).toMatchObject({ status: 410, body: { reason: 'revoked' } });
    expect((await resendInvitation(db.k, director, invitationId)).status).toBe(409);
  });
});

describe('the outbox', () => {
  it('blanks the token out of the stored e-mail once it is sent', async () => {
    await invite('scrub.me@school.example');
    const token = await linkTo('scrub.me@school.example');
    const sent: string[] = [];
    await deliverDue(db.k, async (m) => void sent.push(m.text), {
      now: at(1000),
      retryMs: 1000,
      publicUrl: PUBLIC_URL,
      limit: 100,
    });
    expect(sent.some((t) => t.includes(token))).toBe(true);
    const stored = await db.k('mail_outbox').where({ to_address: 'scrub.me@school.example' }).first();
    expect(stored!.status).toBe('sent');
    expect(stored!.body_text).not.toContain(token);
    expect(stored!.body_text).toContain('/invite/[link removed once sent]');
  });
});

describe('parseInviteCsv and rowRequestId', () => {
  it('reads a header in either order, skips blank rows and keeps line numbers', () => {
    expect(parseInviteCsv('E-mail,Name\r\na@x.example,Ann A\r\n\r\n"b@x.example","Bo, B"\r\n')).toEqual([
      { line: 2, name: 'Ann A', email: 'a@x.example' },
      { line: 4, name: 'Bo, B', email: 'b@x.example' },
    ]);
    expect(parseInviteCsv('Cy C,c@x.example\nd@x.example')).toEqual([
      { line: 1, name: 'Cy C', email: 'c@x.example' },
      { line: 2, name: '', email: 'd@x.example' },
    ]);
  });

  it('derives the same UUID for the same batch and line, another for another', () => {
    const batch = randomUUID();
    expect(rowRequestId(batch, 3)).toBe(rowRequestId(batch, 3));
    expect(rowRequestId(batch, 3)).not.toBe(rowRequestId(batch, 4));
    expect(rowRequestId(batch, 3)).not.toBe(rowRequestId(randomUUID(), 3));
    expect(rowRequestId(batch, 3)).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-8[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
  });
});

describe('inviteFromCsv', () => {
  const CSV = [
    'name,email',
    'Juno Park,juno.park@school.example',
    'Theo Grant,theo.grant@school.example',
    'Juno Park again,JUNO.PARK@school.example',
    'Nell Bright,nell.bright(at)school.example',
    'Otto Brandt,tutor@school.example',
  ].join('\n');

  it('invites each good row once and says what became of every row', async () => {
    const input = { id: randomUUID(), csv: CSV, role: 'student' as const, cohortId: cohort, attendingIds: [attending] };
    const answer = await inviteFromCsv(db.k, director, input, T0);
    expect(answer.status).toBe(200);
    const rows = (answer.body.rows as { line: number; status: string }[]).map((r) => [r.line, r.status]);
    expect(rows).toEqual([
      [2, 'invited'],
      [3, 'invited'],
      [4, 'duplicate'],
      [5, 'bad-email'],
      [6, 'has-account'],
    ]);
    expect(answer.body.invited).toBe(2);
    const juno = await db.k('invitations').where({ email: 'juno.park@school.example' });
    expect(juno).toHaveLength(1);
    expect(juno[0]).toMatchObject({ cohort_id: cohort, name: 'Juno Park', attending_ids_json: `[${attending}]` });

    // The same batch again invites nobody twice: each row's id is the one it had.
    const again = await inviteFromCsv(db.k, director, input, T0);
    expect(again.body.rows).toEqual(answer.body.rows);
    expect(await db.k('invitations').where({ email: 'juno.park@school.example' })).toHaveLength(1);
    expect(await db.k('mail_outbox').where({ to_address: 'theo.grant@school.example' })).toHaveLength(1);
  });

  it('refuses CSV text without a single row, naming the field', async () => {
    const answer = await inviteFromCsv(db.k, director, { id: randomUUID(), csv: 'name,email\n\n', role: 'student' });
    expect(answer).toMatchObject({ status: 400, body: { field: 'csv' } });
  });
});
