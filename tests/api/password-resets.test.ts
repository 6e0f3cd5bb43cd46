// Password resets through the built server (docs/accounts.md): the same answer for every
// address, a link e-mailed only to an active account, setting the password ending every
// session and lifting the holds, a deactivated account refused, and a director's reset. The
// built server has no clock hook: the 1-hour expiry is reached by moving `expires_at` into the
// past in its database (tests/lib/server/password-resets.test.ts injects the clock).
import { randomUUID } from 'node:crypto';
import knexFactory from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import { PAIR_FAILURES } from '../../src/lib/server/signin-limits';
import { hashPassword } from '../../src/lib/server/users';
import { anonymous, apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { freePort, startServer, type TestServer } from '../helpers/server';
import { testSmtp, type Received, type TestSmtp, mailEnv } from '../helpers/smtp';

const PUBLIC_URL = 'https://coneline.school.example';
const NEW_PASSWORD = 'fresh master cone fit 2026';
let server: TestServer;
let smtp: TestSmtp;
let ingrid: ApiClient;
let helen: ApiClient;

beforeAll(async () => {
  smtp = testSmtp(await freePort());
  await smtp.start();
  server = await startServer({
    env: {
      ...mailEnv(smtp.port, PUBLIC_URL),
      // Each test speaks from an address of its own (X-Forwarded-For), so limits do not mix.
      TRUST_PROXY: '1',
    },
  });
  ingrid = await apiSignIn(server.baseUrl, DEMO.ingrid, DEMO.password);
  helen = await apiSignIn(server.baseUrl, DEMO.helen, DEMO.password);
});
afterAll(async () => {
  await server?.stop();
  await smtp?.stop();
});

async function withDb<T>(fn: (k: ReturnType<typeof knexFactory>) => Promise<T>): Promise<T> {
  const k = knexFactory(sqliteOptions(server.dbFile));
  try {
    return await fn(k);
  } finally {
    await k.destroy();
  }
}

async function addAccount(email: string, password = DEMO.password): Promise<number> {
  return withDb(async (k) => {
    const [row] = await k('users')
      .insert({ email, name: 'Reset Tester', role: 'student', password_hash: await hashPassword(password) })
      .returning('id');
    return row!.id;
  });
}

let nextAddress = 1;
const fromAddress = () => ({ 'X-Forwarded-For': `10.30.0.${nextAddress++}` });

const text = (m: Received) => m.raw.replace(/=\r?\n/g, '');
const TOKEN = new RegExp(`${PUBLIC_URL.replace(/\./g, '\\.')}/reset-password/([A-Za-z0-9_-]{43})`);
/** The tokens of the reset e-mails to `email`, oldest first, once `count` have arrived (or after `waitMs`). */
async function linksTo(email: string, count = 1, waitMs = 10_000): Promise<string[]> {
  const deadline = Date.now() + waitMs;
  for (;;) {
    const found = smtp.messages
      .filter((m) => m.to.includes(email) && TOKEN.test(text(m)))
      .map((m) => TOKEN.exec(text(m))![1]!);
    if (found.length >= count || Date.now() > deadline) return found;
    await new Promise((r) => setTimeout(r, 100));
  }
}

const ask = (email: string, headers = fromAddress(), id = randomUUID()) =>
  anonymous(server.baseUrl).post('/api/password-resets', { id, email }, { headers });
const setPassword = (token: string, body: Record<string, unknown> = {}, headers = fromAddress()) =>
  anonymous(server.baseUrl).post(
    `/api/password-resets/${token}`,
    { id: randomUUID(), password: NEW_PASSWORD, ...body },
    { headers },
  );
const meStatus = async (cookie: string) =>
  (await fetch(`${server.baseUrl}/api/me`, { headers: { Cookie: cookie } })).status;

describe('POST /api/password-resets', () => {
  it('answers an unknown address exactly as a known one, and e-mails only the known one', async () => {
    const known = 'known.address@larkfield.example';
    await addAccount(known);
    const a = await ask(known);
    const b = await ask('no.such.person@larkfield.example');
    expect(a.status).toBe(202);
    expect([b.status, await b.text()]).toEqual([a.status, await a.text()]);
    expect(b.headers.get('content-type')).toBe(a.headers.get('content-type'));
    expect(await linksTo(known)).toHaveLength(1);
    expect(smtp.messages.some((m) => m.to.includes('no.such.person@larkfield.example'))).toBe(false);
    expect(
      await withDb((k) => k('audit_log').where({ action: 'user.password-reset-requested' }).count({ n: '*' })),
    ).toEqual([{ n: 1 }]);
  });

  it('sends a deactivated account nothing, with the same answer', async () => {
    const email = 'was.active@larkfield.example';
    const id = await addAccount(email);
    await withDb((k) => k('users').where({ id }).update({ active: false }));
    const res = await ask(email);
    expect([res.status, (await res.json()).accepted]).toEqual([202, true]);
    // The work after the answer takes milliseconds; give it ample time before saying "nothing".
    await new Promise((r) => setTimeout(r, 800));
    expect(await withDb((k) => k('password_resets').where({ user_id: id }))).toEqual([]);
  });

  it('sends one e-mail for one request id sent twice', async () => {
    const email = 'double.send@larkfield.example';
    await addAccount(email);
    const id = randomUUID();
    const headers = fromAddress();
    expect((await ask(email, headers, id)).status).toBe(202);
    expect((await ask(email, headers, id)).status).toBe(202);
    expect(await linksTo(email)).toHaveLength(1);
    await new Promise((r) => setTimeout(r, 800));
    expect(await linksTo(email, 2, 0)).toHaveLength(1);
  });

  it('names the field of a bad address and refuses another origin', async () => {
    const bad = await ask('not an address');
    expect([bad.status, (await bad.json()).field]).toEqual([400, 'email']);
    const foreign = await anonymous(server.baseUrl).post(
      '/api/password-resets',
      { id: randomUUID(), email: DEMO.mira },
      { headers: { ...fromAddress(), Origin: 'https://evil.example' } },
    );
    expect(foreign.status).toBe(403);
  });

  it('sends at most 3 e-mails an hour to one address, and holds an address past 20 requests', async () => {
    const email = 'asks.often@larkfield.example';
    await addAccount(email);
    for (let i = 0; i < 4; i++) expect((await ask(email)).status).toBe(202);
    expect(await linksTo(email, 3)).toHaveLength(3);
    await new Promise((r) => setTimeout(r, 800));
    expect(await linksTo(email, 4, 0)).toHaveLength(3);

    const headers = fromAddress();
    for (let i = 0; i < 20; i++) expect((await ask(`nobody${i}@larkfield.example`, headers)).status).toBe(202);
    const held = await ask('nobody.more@larkfield.example', headers);
    expect(held.status).toBe(429);
    expect(Number(held.headers.get('retry-after'))).toBeGreaterThan(0);
  });
});

describe('POST /api/password-resets/{token}', () => {
  it('sets the password, ends every session, lifts the holds and signs nobody in', async () => {
    const email = 'locked.out@larkfield.example';
    await addAccount(email);
    const tablet = await apiSignIn(server.baseUrl, email, DEMO.password);
    const desk = await apiSignIn(server.baseUrl, email, DEMO.password);
    // Wrong passwords from this machine put a hold on the account here.
    for (let i = 0; i < PAIR_FAILURES; i++)
      await expect(apiSignIn(server.baseUrl, email, 'not-my-password')).rejects.toThrow();
    await expect(apiSignIn(server.baseUrl, email, DEMO.password)).rejects.toThrow(/throttled/);

    expect((await ask(email)).status).toBe(202);
    const [token] = await linksTo(email);
    const page = await anonymous(server.baseUrl).fetch(`/reset-password/${token}`, { headers: fromAddress() });
    expect(page.status).toBe(200);
    expect(page.headers.get('referrer-policy')).toBe('no-referrer');
    expect(page.headers.get('cache-control')).toBe('no-store');

    const res = await setPassword(token!);
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ reset: true, signIn: '/signin?code=password-set' });
    expect(res.headers.getSetCookie()).toEqual([]);
    // The old cookies replayed: both sessions have ended.
    expect(await meStatus(tablet.cookie)).toBe(401);
    expect(await meStatus(desk.cookie)).toBe(401);
    // The hold is lifted: the new password works at once from the same machine; the old one not.
    await expect(apiSignIn(server.baseUrl, email, DEMO.password)).rejects.toThrow();
    const back = await apiSignIn(server.baseUrl, email, NEW_PASSWORD);
    expect(await meStatus(back.cookie)).toBe(200);

    const again = await setPassword(token!);
    expect(again.status).toBe(410);
    expect(await again.json()).toMatchObject({ reason: 'used' });
    expect(server.output()).not.toContain(token);
  });

  it('is refused for an account deactivated since the link was sent, with a plain reason', async () => {
    const email = 'deactivated.since@larkfield.example';
    const id = await addAccount(email);
    expect((await ask(email)).status).toBe(202);
    const [token] = await linksTo(email);
    await withDb((k) => k('users').where({ id }).update({ active: false }));
    const res = await setPassword(token!);
    expect(res.status).toBe(409);
    expect((await res.json()).error).toMatch(/deactivated/);
    const page = await anonymous(server.baseUrl).fetch(`/reset-password/${token}`, { headers: fromAddress() });
    expect(page.status).toBe(409);
  });

  it('is refused after an hour, and names the password field when the policy refuses it', async () => {
    const email = 'slow.reader@larkfield.example';
    await addAccount(email);
    expect((await ask(email)).status).toBe(202);
    const [token] = await linksTo(email);
    const weak = await setPassword(token!, { password: 'password1234' });
    expect([weak.status, (await weak.json()).field]).toEqual([400, 'password']);
    await withDb((k) =>
      k('password_resets')
        .whereIn('user_id', k('users').select('id').where({ email }))
        .update({ expires_at: new Date(Date.now() - 1).toISOString() }),
    );
    const late = await setPassword(token!);
    expect(late.status).toBe(410);
    expect(await late.json()).toMatchObject({ reason: 'expired', error: expect.stringMatching(/1 hour/) });
  });
});

describe('POST /api/users/{userId}/password-reset', () => {
  it('lets a director send the link, once per request id, and no one else', async () => {
    const email = 'sent.a.link@larkfield.example';
    const userId = await addAccount(email);
    const path = `/api/users/${userId}/password-reset`;
    expect((await helen.post(path, { id: randomUUID() })).status).toBe(403);
    expect((await anonymous(server.baseUrl).post(path, { id: randomUUID() })).status).toBe(401);
    const id = randomUUID();
    const sent = await ingrid.post(path, { id });
    expect(sent.status).toBe(202);
    const again = await ingrid.post(path, { id });
    expect([again.status, await again.json()]).toEqual([202, await sent.json()]);
    const [token] = await linksTo(email);
    await new Promise((r) => setTimeout(r, 600));
    expect(await linksTo(email, 2, 0)).toHaveLength(1);
    const mail = smtp.messages.find((m) => m.to.includes(email))!;
    expect(text(mail)).toContain('course director sent you this link');
    expect((await setPassword(token!)).status).toBe(200);

    expect((await ingrid.post('/api/users/99999/password-reset', { id: randomUUID() })).status).toBe(404);
    const gone = await addAccount('gone.away@larkfield.example');
    await withDb((k) => k('users').where({ id: gone }).update({ active: false }));
    const refused = await ingrid.post(`/api/users/${gone}/password-reset`, { id: randomUUID() });
    expect(refused.status).toBe(409);
    expect((await refused.json()).error).toMatch(/deactivated/);
  });
});
