// Invitations through the built server (docs/accounts.md): a director invites, the e-mail with
// its link is caught by an in-process SMTP server, the link makes the account once, and is
// refused a second time, after 7 days, once resent or revoked; CSV of a small invented cohort.
// The built server has no clock hook: expiry is reached by moving `expires_at` into the past in
// its database (tests/lib/server/invitations.test.ts injects the clock into the service).
import { randomUUID } from 'node:crypto';
import knexFactory from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import { anonymous, apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { freePort, startServer, type TestServer } from '../helpers/server';
import { testSmtp, type Received, type TestSmtp, mailEnv } from '../helpers/smtp';

const PUBLIC_URL = 'https://coneline.school.example';
const PASSWORD = 'apical third sealed 2026';
let server: TestServer;
let smtp: TestSmtp;
let ingrid: ApiClient;
let helen: ApiClient;
let mira: ApiClient;

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
  mira = await apiSignIn(server.baseUrl, DEMO.mira, DEMO.password);
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

const text = (m: Received) => m.raw.replace(/=\r?\n/g, '');
/** The tokens of the invitation e-mails to `email`, oldest first, once `count` have arrived. */
async function linksTo(email: string, count = 1): Promise<string[]> {
  const deadline = Date.now() + 10_000;
  for (;;) {
    const found = smtp.messages
      .filter((m) => m.to.includes(email) && /\/invite\//.test(text(m)))
      .map((m) => {
        const link = new RegExp(`${PUBLIC_URL.replace(/\./g, '\\.')}/invite/([A-Za-z0-9_-]{43})`).exec(text(m));
        return link ? link[1]! : '';
      });
    if (found.length >= count || Date.now() > deadline) return found;
    await new Promise((r) => setTimeout(r, 100));
  }
}

let nextAddress = 1;
/** A client address of its own for one test (the server trusts X-Forwarded-For here). */
const fromAddress = () => ({ 'X-Forwarded-For': `10.20.0.${nextAddress++}` });

const invite = (body: Record<string, unknown>, as = ingrid) =>
  as.post('/api/invitations', { id: randomUUID(), role: 'student', ...body });
const accept = (token: string, body: Record<string, unknown>, headers: Record<string, string> = fromAddress()) =>
  anonymous(server.baseUrl).post(`/api/invitations/${token}/accept`, { id: randomUUID(), ...body }, { headers });

describe('POST /api/invitations', () => {
  it('invites an address and e-mails it the link, which makes the account once and signs nobody in', async () => {
    const email = 'ada.quill@school.example';
    const res = await invite({ email, name: 'Ada Quill', cohortId: 1, attendingIds: [4] });
    expect(res.status).toBe(201);
    const { invitation } = (await res.json()) as { invitation: { invitationId: number; status: string } };
    expect(invitation.status).toBe('pending');
    const [token] = await linksTo(email);
    expect(token).toHaveLength(43);
    expect(server.output()).not.toContain(token);

    const page = await anonymous(server.baseUrl).fetch(`/invite/${token}`, { headers: fromAddress() });
    expect(page.status).toBe(200);
    expect(page.headers.get('referrer-policy')).toBe('no-referrer');
    expect(page.headers.get('cache-control')).toBe('no-store');
    const html = await page.text();
    expect(html).toContain(email);
    expect(html).toContain('Ada Quill');

    const id = randomUUID();
    const made = await accept(token!, { id, name: 'Ada Quill', password: PASSWORD });
    expect(made.status).toBe(201);
    const body = await made.json();
    expect(body).toEqual({ accepted: true, email, signIn: '/signin?code=welcome' });
    expect(made.headers.getSetCookie()).toEqual([]);

    // The same request again answers the first answer; a second use of the link is refused.
    const repeat = await accept(token!, { id, name: 'Ada Quill', password: PASSWORD });
    expect([repeat.status, await repeat.json()]).toEqual([201, body]);
    const second = await accept(token!, { name: 'Not Ada', password: PASSWORD });
    expect(second.status).toBe(410);
    expect(await second.json()).toMatchObject({ reason: 'accepted' });
    expect((await anonymous(server.baseUrl).fetch(`/invite/${token}`, { headers: fromAddress() })).status).toBe(410);

    const ada = await apiSignIn(server.baseUrl, email, PASSWORD);
    expect(await (await ada.fetch('/api/me')).json()).toMatchObject({ email, name: 'Ada Quill', role: 'student' });
    const stored = await withDb(async (k) => {
      const user = await k('users').where({ email }).first();
      return { user, attendings: await k('assignments').where({ student_id: user!.id }).pluck('attending_id') };
    });
    expect(stored.user).toMatchObject({ cohort_id: 1 });
    expect(stored.attendings).toEqual([4]);
  });

  it('answers 409 for an address that has an account, and for one with a pending invitation', async () => {
    const taken = await invite({ email: DEMO.mira.toUpperCase() });
    expect(taken.status).toBe(409);
    expect(await taken.json()).toMatchObject({ field: 'email', reason: 'has-account' });

    expect((await invite({ email: 'pending.once@school.example' })).status).toBe(201);
    const again = await invite({ email: 'pending.once@school.example' });
    expect(again.status).toBe(409);
    expect(await again.json()).toMatchObject({ reason: 'already-invited' });
  });

  it('refuses anyone but a director, and anonymous callers', async () => {
    for (const who of [helen, mira]) {
      const res = await invite({ email: 'not.by.you@school.example' }, who);
      expect(res.status).toBe(403);
    }
    expect((await invite({ email: 'not.by.you@school.example' }, anonymous(server.baseUrl))).status).toBe(401);
    expect((await helen.fetch('/api/invitations')).status).toBe(403);
    expect(await withDb((k) => k('invitations').where({ email: 'not.by.you@school.example' }))).toEqual([]);
  });

  it('answers the first answer to the same id, and 409 to the same id with another body', async () => {
    const id = randomUUID();
    const first = await ingrid.post('/api/invitations', { id, email: 'same.id@school.example', role: 'attending' });
    const again = await ingrid.post('/api/invitations', { id, email: 'same.id@school.example', role: 'attending' });
    expect(first.status).toBe(201);
    expect([again.status, await again.json()]).toEqual([201, await first.json()]);
    const other = await ingrid.post('/api/invitations', { id, email: 'other.body@school.example', role: 'attending' });
    expect(other.status).toBe(409);
    expect(await withDb((k) => k('invitations').where({ email: 'same.id@school.example' }))).toHaveLength(1);
    expect(await linksTo('same.id@school.example')).toHaveLength(1);
  });

  it('answers 400 naming the field for a bad body, and stores nothing', async () => {
    const cases: [Record<string, unknown>, string][] = [
      [{ email: 'not-an-address' }, 'email'],
      [{ email: 'role@school.example', role: 'dean' }, 'role'],
      [{ email: 'tutor.kids@school.example', role: 'attending', attendingIds: [4] }, 'attendingIds'],
      [{ email: 'no.cohort@school.example', cohortId: 9999 }, 'cohortId'],
    ];
    for (const [body, field] of cases) {
      const res = await invite(body);
      expect(res.status, field).toBe(400);
      expect(await res.json(), field).toMatchObject({ field });
    }
  });
});

describe('POST /api/invitations/{token}/accept', () => {
  it('is refused after 7 days', async () => {
    const email = 'too.late@school.example';
    expect((await invite({ email })).status).toBe(201);
    const [token] = await linksTo(email);
    await withDb((k) =>
      k('invitations')
        .where({ email })
        .update({ expires_at: new Date(Date.now() - 1).toISOString() }),
    );
    const res = await accept(token!, { name: 'Too Late', password: PASSWORD });
    expect(res.status).toBe(410);
    expect(await res.json()).toMatchObject({ reason: 'expired', error: expect.stringMatching(/7 days/) });
    expect(await withDb((k) => k('users').where({ email }))).toEqual([]);
  });

  it('names the field at fault, checks the origin, and counts tries per link', async () => {
    const email = 'careful.typist@school.example';
    expect((await invite({ email })).status).toBe(201);
    const [token] = await linksTo(email);
    const headers = fromAddress();
    const weak = await accept(token!, { name: 'Careful', password: 'password1234' }, headers);
    expect([weak.status, (await weak.json()).field]).toEqual([400, 'password']);
    const noName = await accept(token!, { name: '  ', password: PASSWORD }, headers);
    expect([noName.status, (await noName.json()).field]).toEqual([400, 'name']);
    const foreign = await accept(
      token!,
      { name: 'Careful', password: PASSWORD },
      { ...headers, Origin: 'https://evil.example' },
    );
    expect(foreign.status).toBe(403);
    expect(await withDb((k) => k('users').where({ email }))).toEqual([]);

    // Ten tries per link in 15 minutes, from any addresses; the eleventh waits.
    const bogus = 'A'.repeat(43);
    const statuses: number[] = [];
    for (let i = 0; i < 10; i++) statuses.push((await accept(bogus, { name: 'Guess', password: PASSWORD })).status);
    expect(statuses).toEqual(Array(10).fill(404));
    const limited = await accept(bogus, { name: 'Guess', password: PASSWORD });
    expect(limited.status).toBe(429);
    expect(Number(limited.headers.get('retry-after'))).toBeGreaterThan(0);
  });
});

describe('resend and revoke', () => {
  it('kills the old link on a resend, and every link on a revoke', async () => {
    const email = 'link.twice@school.example';
    const res = await invite({ email });
    const { invitation } = (await res.json()) as { invitation: { invitationId: number } };
    const path = `/api/invitations/${invitation.invitationId}`;
    expect((await helen.post(`${path}/resend`, { id: randomUUID() })).status).toBe(403);
    const resent = await ingrid.post(`${path}/resend`, { id: randomUUID() });
    expect(resent.status).toBe(200);
    expect(await resent.json()).toMatchObject({ invitation: { status: 'pending', sentCount: 2 } });
    const [old, fresh] = await linksTo(email, 2);
    expect(fresh).not.toBe(old);
    expect((await accept(old!, { name: 'Old Link', password: PASSWORD })).status).toBe(404);

    const revoked = await ingrid.post(`${path}/revoke`, { id: randomUUID() });
    expect(revoked.status).toBe(200);
    expect(await revoked.json()).toMatchObject({ invitation: { status: 'revoked' } });
    const refused = await accept(fresh!, { name: 'Fresh Link', password: PASSWORD });
    expect(refused.status).toBe(410);
    expect(await refused.json()).toMatchObject({ reason: 'revoked' });
    expect((await ingrid.post('/api/invitations/99999/revoke', { id: randomUUID() })).status).toBe(404);

    const list = (await (await ingrid.fetch('/api/invitations')).json()) as {
      invitations: { email: string; status: string }[];
    };
    expect(list.invitations.find((i) => i.email === email)?.status).toBe('revoked');
  });
});

describe('POST /api/invitations/csv', () => {
  // An invented cohort of five rows: two new students, one of them twice, a bad address and
  // someone who already has an account.
  const CSV = [
    'name,email',
    'Bea Lindgren,bea.lindgren@school.example',
    'Cal Ortega,cal.ortega@school.example',
    'Bea Lindgren,Bea.Lindgren@school.example',
    'Dot Yamada,dot.yamada.school.example',
    `Mira Okafor,${DEMO.mira}`,
  ].join('\n');

  it('invites each row through the same service, says what became of each, and invites nobody twice', async () => {
    const body = { id: randomUUID(), csv: CSV, role: 'student', cohortId: 1, attendingIds: [4] };
    const res = await ingrid.post('/api/invitations/csv', body);
    expect(res.status).toBe(200);
    const answer = (await res.json()) as { invited: number; rows: { line: number; email: string; status: string }[] };
    expect(answer.rows.map((r) => [r.line, r.status])).toEqual([
      [2, 'invited'],
      [3, 'invited'],
      [4, 'duplicate'],
      [5, 'bad-email'],
      [6, 'has-account'],
    ]);
    expect(answer.invited).toBe(2);
    expect(await linksTo('bea.lindgren@school.example')).toHaveLength(1);
    expect(await linksTo('cal.ortega@school.example')).toHaveLength(1);

    const again = await ingrid.post('/api/invitations/csv', body);
    expect([again.status, await again.json()]).toEqual([200, answer]);
    await new Promise((r) => setTimeout(r, 600));
    expect(smtp.messages.filter((m) => m.to.includes('bea.lindgren@school.example'))).toHaveLength(1);
    expect(await withDb((k) => k('invitations').where({ email: 'bea.lindgren@school.example' }))).toHaveLength(1);
  });

  it('is for directors only', async () => {
    const res = await helen.post('/api/invitations/csv', { id: randomUUID(), csv: CSV, role: 'student' });
    expect(res.status).toBe(403);
  });
});

describe('the outbox copy', () => {
  it('keeps no token once the invitation e-mail is sent', async () => {
    const email = 'scrubbed@school.example';
    expect((await invite({ email })).status).toBe(201);
    const [token] = await linksTo(email);
    const deadline = Date.now() + 5000;
    let row: { status: string; body_text: string } | undefined;
    while (Date.now() < deadline) {
      row = await withDb((k) => k('mail_outbox').where({ to_address: email }).first());
      if (row?.status === 'sent') break;
      await new Promise((r) => setTimeout(r, 100));
    }
    expect(row?.status).toBe('sent');
    expect(row?.body_text).not.toContain(token);
  });
});
