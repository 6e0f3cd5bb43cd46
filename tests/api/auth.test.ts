import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import knexFactory from 'knex';
import { startServer, type TestServer } from '../helpers/server';
import { anonymous, apiSignIn, DEMO } from '../helpers/client';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import { hashPassword } from '../../src/lib/server/users';

let server: TestServer;
beforeAll(async () => {
  server = await startServer();
});
afterAll(async () => {
  await server?.stop();
});

async function postSignIn(fields: Record<string, string>): Promise<Response> {
  const csrf = await fetch(`${server.baseUrl}/api/auth/csrf`);
  const cookie = csrf.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  return fetch(`${server.baseUrl}/api/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded', Origin: server.baseUrl, Cookie: cookie },
    body: new URLSearchParams({ csrfToken, ...fields }),
  });
}

describe('signing in', () => {
  it.each([
    ['student', DEMO.mira],
    ['attending', DEMO.helen],
    ['director', DEMO.ingrid],
  ])('lets the demo %s in and tells who they are', async (role, email) => {
    const api = await apiSignIn(server.baseUrl, email, DEMO.password);
    const me = await api.fetch('/api/me');
    expect(me.status).toBe(200);
    expect(await me.json()).toMatchObject({ email, role });
  });

  it('sends a wrong password back to the sign-in page with a reason code, not an error page', async () => {
    const res = await postSignIn({ email: DEMO.mira, password: 'not-the-password' });
    expect(res.status).toBe(302);
    const to = new URL(res.headers.get('location')!, server.baseUrl);
    expect(to.pathname).toBe('/signin');
    expect(to.searchParams.get('code')).toBe('credentials');
    const page = await fetch(to);
    expect(await page.text()).toContain('do not match an active account');
  });

  it('treats an unknown e-mail exactly like a wrong password', async () => {
    const res = await postSignIn({ email: 'nobody@larkfield.example', password: 'whatever-it-is' });
    expect(new URL(res.headers.get('location')!, server.baseUrl).searchParams.get('code')).toBe('credentials');
  });

  it('asks for both fields when one is missing', async () => {
    const res = await postSignIn({ email: DEMO.mira });
    const to = new URL(res.headers.get('location')!, server.baseUrl);
    expect(to.searchParams.get('code')).toBe('missing');
    expect(await (await fetch(to)).text()).toContain('Enter both your e-mail address and your password.');
  });

  it('refuses further attempts on an account after five failures, even with the right password', async () => {
    const email = 'guessed.at@larkfield.example';
    const k = knexFactory(sqliteOptions(server.dbFile));
    try {
      await k('users').insert({
        email,
        name: 'Guessed At',
        role: 'student',
        password_hash: await hashPassword(DEMO.password),
      });
    } finally {
      await k.destroy();
    }
    await expect(apiSignIn(server.baseUrl, email, DEMO.password)).resolves.toBeDefined();
    for (let i = 0; i < 5; i++) {
      const res = await postSignIn({ email, password: `wrong-guess-${i}` });
      expect(new URL(res.headers.get('location')!, server.baseUrl).searchParams.get('code')).toBe('credentials');
    }
    const locked = await postSignIn({ email, password: DEMO.password });
    const to = new URL(locked.headers.get('location')!, server.baseUrl);
    expect(to.searchParams.get('code')).toBe('throttled');
    expect(await (await fetch(to)).text()).toContain('Too many failed sign-ins');
    // Other accounts are not affected.
    await expect(apiSignIn(server.baseUrl, DEMO.helen, DEMO.password)).resolves.toBeDefined();
  });

  it('refuses a form post from another site (origin check)', async () => {
    const res = await fetch(`${server.baseUrl}/signout`, {
      method: 'POST',
      redirect: 'manual',
      headers: { 'Content-Type': 'application/x-www-form-urlencoded', Origin: 'https://elsewhere.example' },
      body: '',
    });
    expect(res.status).toBe(403);
  });
});

describe('the gate', () => {
  it('sends an anonymous visitor of any page, the home page included, to sign in', async () => {
    for (const path of ['/', '/admin', '/account', '/signout']) {
      const res = await anonymous(server.baseUrl).fetch(path);
      expect(res.status).toBe(302);
      expect(res.headers.get('location')).toBe(`/signin?callbackUrl=${encodeURIComponent(path)}`);
    }
  });

  it('answers an anonymous API call with 401 JSON', async () => {
    const res = await anonymous(server.baseUrl).fetch('/api/me');
    expect(res.status).toBe(401);
    expect(await res.json()).toEqual({ error: 'Sign in first.' });
  });

  it('answers a student who opens a director page with 403 and a plain page', async () => {
    const api = await apiSignIn(server.baseUrl, DEMO.mira, DEMO.password);
    const res = await api.fetch('/admin');
    expect(res.status).toBe(403);
    expect(await res.text()).toContain('not open to your role');
  });

  it('lets a director open the administration page, and tells the browser not to keep a copy', async () => {
    const api = await apiSignIn(server.baseUrl, DEMO.ingrid, DEMO.password);
    const res = await api.fetch('/admin');
    expect(res.status).toBe(200);
    expect(res.headers.get('cache-control')).toBe('no-store');
  });

  it('shows each role its own home page', async () => {
    const student = await (await (await apiSignIn(server.baseUrl, DEMO.tomas, DEMO.password)).fetch('/')).text();
    expect(student).toContain('Your cases');
    const attending = await (await (await apiSignIn(server.baseUrl, DEMO.samuel, DEMO.password)).fetch('/')).text();
    expect(attending).toContain('Waiting for your review');
    const director = await (await (await apiSignIn(server.baseUrl, DEMO.ingrid, DEMO.password)).fetch('/')).text();
    expect(director).toContain('Cohorts');
  });
});

describe('ending a session', () => {
  it('makes the old session cookie useless after sign-out', async () => {
    const api = await apiSignIn(server.baseUrl, DEMO.priya, DEMO.password);
    const stolen = api.cookie;
    const out = await api.fetch('/signout', {
      method: 'POST',
      headers: { Origin: server.baseUrl, 'Content-Type': 'application/x-www-form-urlencoded' },
      body: '',
    });
    expect(out.status).toBe(303);
    const replay = await fetch(`${server.baseUrl}/api/me`, { headers: { Cookie: stolen } });
    expect(replay.status).toBe(401);
  });

  it('ends the session of a deactivated account at once', async () => {
    const api = await apiSignIn(server.baseUrl, DEMO.samuel, DEMO.password);
    expect((await api.fetch('/api/me')).status).toBe(200);
    const k = knexFactory(sqliteOptions(server.dbFile));
    try {
      await k('users').where({ email: DEMO.samuel }).update({ active: false });
      expect((await api.fetch('/api/me')).status).toBe(401);
      await expect(apiSignIn(server.baseUrl, DEMO.samuel, DEMO.password)).rejects.toThrow(/sign-in failed/);
    } finally {
      await k('users').where({ email: DEMO.samuel }).update({ active: true });
      await k.destroy();
    }
  });
});
