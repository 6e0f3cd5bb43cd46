// Password resets in-process (docs/accounts.md) with an injected clock: a link lasts 1 hour and
// works once, a newer one replaces it, setting the password ends every session and lifts the
// sign-in holds, a deactivated account is refused, and unknown addresses get no e-mail.
import { randomUUID } from 'node:crypto';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tokenHash } from '../../../src/lib/server/account-tokens';
import {
  confirmReset,
  requestReset,
  RESET_TTL_MS,
  resetForLink,
  sendResetFor,
} from '../../../src/lib/server/password-resets';
import { createSession, sessionUser } from '../../../src/lib/server/sessions';
import { recordSigninFailure, signinHold, PAIR_FAILURES } from '../../../src/lib/server/signin-limits';
import { syncDb, type SyncDb } from '../../helpers/sync-db';

const PUBLIC_URL = 'https://coneline.school.example';
let db: SyncDb;
let directorId: number;
const T0 = new Date('2026-12-07T09:00:00.000Z');
const at = (ms: number) => new Date(T0.getTime() + ms);
const PASSWORD = 'a new gutta-percha point';

beforeAll(async () => {
  Object.assign(process.env, {
    PUBLIC_URL,
    AUTH_SECRET: 'unit-test-secret-unit-test-secret-0123456789',
    DATA_DIR: mkdtempSync(join(tmpdir(), 'coneline-reset-')),
  });
  db = await syncDb();
  const [d] = await db
    .k('users')
    .insert({ email: 'head@school.example', name: 'Dr Head', role: 'director' })
    .returning('id');
  directorId = d!.id;
});
afterAll(async () => {
  await db.close();
});

async function account(email: string, active = true): Promise<number> {
  const [row] = await db
    .k('users')
    .insert({ email, name: email, role: 'student', active, password_hash: 'old-hash' })
    .returning('id');
  return row!.id;
}

/** The token in the newest reset e-mail to `email`, or null. */
async function linkTo(email: string): Promise<string | null> {
  const mail = await db
    .k('mail_outbox')
    .where({ to_address: email, kind: 'password-reset' })
    .orderBy('created_at', 'desc')
    .orderBy('id', 'desc')
    .first();
  return mail ? /\/reset-password\/([A-Za-z0-9_-]{43})/.exec(mail.body_text)![1]! : null;
}

const ask = (email: string, now = T0, id = randomUUID()) => requestReset(db.k, { id, email }, now);

describe('requestReset', () => {
  it('writes a link and its e-mail for an active account only, never for an unknown or deactivated one', async () => {
    await account('active.one@school.example');
    await account('gone.one@school.example', false);
    expect(await ask('active.one@school.example')).toBe(true);
    expect(await ask('nobody.here@school.example')).toBe(false);
    expect(await ask('gone.one@school.example')).toBe(false);
    const token = await linkTo('active.one@school.example');
    const row = await db
      .k('password_resets')
      .where({ token_hash: tokenHash(token!) })
      .first();
    expect(row).toMatchObject({ requested_by: null, expires_at: at(RESET_TTL_MS).toISOString(), used_at: null });
    expect(await linkTo('nobody.here@school.example')).toBeNull();
    expect(await linkTo('gone.one@school.example')).toBeNull();
  });

  it('sends one e-mail for one request id, however often it is sent', async () => {
    await account('double.tap@school.example');
    const id = randomUUID();
    expect(await ask('double.tap@school.example', T0, id)).toBe(true);
    expect(await ask('double.tap@school.example', T0, id)).toBe(false);
    expect(await db.k('mail_outbox').where({ to_address: 'double.tap@school.example' })).toHaveLength(1);
  });
});

describe('confirmReset', () => {
  it('works within the hour and is refused from the hour on', async () => {
    await account('on.time@school.example');
    await ask('on.time@school.example');
    const token = (await linkTo('on.time@school.example'))!;
    expect((await resetForLink(db.k, token, at(RESET_TTL_MS - 1))).status).toBe('usable');
    const late = await confirmReset(db.k, token, { id: randomUUID(), password: PASSWORD }, { now: at(RESET_TTL_MS) });
    expect(late).toMatchObject({ status: 410, body: { reason: 'expired' } });
    const ok = await confirmReset(db.k, token, { id: randomUUID(), password: PASSWORD }, { now: at(RESET_TTL_MS - 1) });
    expect(ok.status).toBe(200);
  });

  it('sets the password once, ends every session, lifts the holds and signs nobody in', async () => {
    const email = 'locked.out@school.example';
    const userId = await account(email);
    const sessions = [await createSession(db.k, userId), await createSession(db.k, userId)];
    for (let i = 0; i < PAIR_FAILURES; i++) await recordSigninFailure(db.k, email, '10.1.2.3');
    expect(await signinHold(db.k, email, '10.1.2.3')).toBeGreaterThan(0);
    await ask(email, new Date());
    const token = (await linkTo(email))!;
    const id = randomUUID();
    const answer = await confirmReset(db.k, token, { id, password: PASSWORD });
    expect(answer).toEqual({ status: 200, body: { reset: true, signIn: '/signin?code=password-set' } });
    for (const s of sessions) expect(await sessionUser(db.k, s)).toBeUndefined();
    expect(await db.k('sessions').where({ user_id: userId }).whereNull('ended_at')).toEqual([]);
    expect(await signinHold(db.k, email, '10.1.2.3')).toBe(0);
    const user = await db.k('users').where({ id: userId }).first();
    expect(user!.password_hash).not.toBe('old-hash');
    expect(user!.password_hash).toMatch(/^\$argon2id\$/);
    const line = await db
      .k('audit_log')
      .where({ action: 'user.password-reset', subject_id: String(userId) })
      .first();
    expect(JSON.parse(line!.detail_json!)).toMatchObject({ sessionsEnded: 2, holdsLifted: 1 });

    // The same request again gets its answer; another use of the link is refused.
    expect(await confirmReset(db.k, token, { id, password: PASSWORD })).toEqual(answer);
    const again = await confirmReset(db.k, token, { id: randomUUID(), password: PASSWORD });
    expect(again).toMatchObject({ status: 410, body: { reason: 'used' } });
  });

  it('refuses an older link once a newer one was sent', async () => {
    await account('two.links@school.example');
    await ask('two.links@school.example', at(0));
    const older = (await linkTo('two.links@school.example'))!;
    await ask('two.links@school.example', at(1000));
    const newer = (await linkTo('two.links@school.example'))!;
    expect(newer).not.toBe(older);
    const answer = await confirmReset(db.k, older, { id: randomUUID(), password: PASSWORD }, { now: at(2000) });
    expect(answer).toMatchObject({ status: 410, body: { reason: 'superseded' } });
    expect((await confirmReset(db.k, newer, { id: randomUUID(), password: PASSWORD }, { now: at(2000) })).status).toBe(
      200,
    );
  });

  it('refuses a deactivated account with a plain reason and changes nothing', async () => {
    const userId = await account('deactivated.later@school.example');
    await ask('deactivated.later@school.example', new Date());
    const token = (await linkTo('deactivated.later@school.example'))!;
    await db.k('users').where({ id: userId }).update({ active: false });
    const answer = await confirmReset(db.k, token, { id: randomUUID(), password: PASSWORD });
    expect(answer.status).toBe(409);
    expect(answer.body.error).toMatch(/deactivated/);
    expect((await db.k('users').where({ id: userId }).first())!.password_hash).toBe('old-hash');
  });

  it('hashes the password whether the link is live or names nothing', async () => {
    await account('hash.both@school.example');
    await ask('hash.both@school.example', new Date());
    const token = (await linkTo('hash.both@school.example'))!;
    const calls: string[] = [];
    const hash = async (p: string) => (calls.push(p), `hashed:${p}`);
    const dead = await confirmReset(db.k, 'y'.repeat(43), { id: randomUUID(), password: PASSWORD }, { hash });
    const live = await confirmReset(db.k, token, { id: randomUUID(), password: PASSWORD }, { hash });
    expect([dead.status, live.status]).toEqual([404, 200]);
    expect(calls).toEqual([PASSWORD, PASSWORD]);
  });
});

describe('sendResetFor', () => {
  it('sends a director’s link to an active account, and refuses a deactivated or unknown one', async () => {
    const active = await account('sent.by.head@school.example');
    const inactive = await account('not.active@school.example', false);
    const answer = await sendResetFor(db.k, directorId, active, T0);
    expect(answer).toMatchObject({ status: 202, body: { sent: true, expiresAt: at(RESET_TTL_MS).toISOString() } });
    const token = (await linkTo('sent.by.head@school.example'))!;
    expect(
      await db
        .k('password_resets')
        .where({ token_hash: tokenHash(token) })
        .first(),
    ).toMatchObject({
      requested_by: directorId,
    });
    const mail = await db.k('mail_outbox').where({ to_address: 'sent.by.head@school.example' }).first();
    expect(mail!.body_text).toContain('Your course director sent you this link');
    expect((await sendResetFor(db.k, directorId, inactive)).status).toBe(409);
    expect((await sendResetFor(db.k, directorId, 999_999)).status).toBe(404);
  });
});
