// Our sign-in route: bodies and fields capped before any hashing, failures limited per
// (account, address) and per address in SQLite, unknown Auth.js actions answered 404.
import knexFactory from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import { hashPassword } from '../../src/lib/server/users';
import { apiSignIn, DEMO } from '../helpers/client';
import { fromAddress } from '../helpers/from-address';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
beforeAll(async () => {
  server = await startServer();
});
afterAll(async () => {
  await server?.stop();
});

/** Adds an account of our own, so tests do not hold each other's demo users. */
async function addAccount(s: TestServer, email: string): Promise<void> {
  const k = knexFactory(sqliteOptions(s.dbFile));
  try {
    await k('users').insert({
      email,
      name: 'Test Account',
      role: 'student',
      password_hash: await hashPassword(DEMO.password),
    });
  } finally {
    await k.destroy();
  }
}

interface Outcome {
  status: number;
  signedIn: boolean;
  code: string | null;
  wait: number | null;
}

/** Posts the sign-in form from a loopback address of our choice, as a browser would. */
async function signInFrom(
  s: TestServer,
  address: string,
  email: string,
  password: string,
  headers: Record<string, string> = {},
): Promise<Outcome> {
  const csrf = await fromAddress(address, `${s.baseUrl}/api/auth/csrf`, { headers });
  const cookie = ([] as string[])
    .concat(csrf.headers['set-cookie'] ?? [])
    .map((c) => c.split(';')[0])
    .join('; ');
  const { csrfToken } = JSON.parse(csrf.text) as { csrfToken: string };
  const res = await fromAddress(address, `${s.baseUrl}/api/auth/callback/credentials`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded', Origin: s.baseUrl, Cookie: cookie, ...headers },
    body: new URLSearchParams({ csrfToken, email, password, callbackUrl: '/' }).toString(),
  });
  const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  const location = new URL(String(res.headers.location ?? '/'), s.baseUrl);
  return {
    status: res.status,
    signedIn: cookies.some((c) => /session-token=[^;]+/.test(c)),
    code: location.searchParams.get('code'),
    wait: location.searchParams.has('wait') ? Number(location.searchParams.get('wait')) : null,
  };
}

async function failTimes(
  s: TestServer,
  n: number,
  address: string,
  email: (i: number) => string,
  headers: Record<string, string> = {},
) {
  for (let i = 0; i < n; i++) {
    const r = await signInFrom(s, address, email(i), `wrong-guess-number-${i}`, headers);
    expect(r.code).toBe('credentials');
  }
}

describe('the limits on failed sign-ins', () => {
  it('holds an account from one address after five failures, even for the right password, and says how long', async () => {
    const email = 'held.pair@larkfield.example';
    await addAccount(server, email);
    await failTimes(server, 5, '127.0.0.2', () => email);
    const held = await signInFrom(server, '127.0.0.2', email, DEMO.password);
    expect(held.signedIn).toBe(false);
    expect(held.code).toBe('throttled');
    expect(held.wait).toBeGreaterThan(14 * 60);
    expect(held.wait).toBeLessThanOrEqual(15 * 60);
    const page = await fetch(`${server.baseUrl}/signin?code=throttled&wait=${held.wait}`);
    expect(await page.text()).toContain('Wait 15 minutes');
  });

  it('lets the right password in from another address while one address is held for that account', async () => {
    const email = 'owner.elsewhere@larkfield.example';
    await addAccount(server, email);
    await failTimes(server, 5, '127.0.0.3', () => email);
    expect((await signInFrom(server, '127.0.0.3', email, DEMO.password)).code).toBe('throttled');
    expect((await signInFrom(server, '127.0.0.4', email, DEMO.password)).signedIn).toBe(true);
  });

  it('never counts successful sign-ins, and a success clears its own count', async () => {
    const email = 'often.in@larkfield.example';
    await addAccount(server, email);
    for (let i = 0; i < 8; i++)
      expect((await signInFrom(server, '127.0.0.5', email, DEMO.password)).signedIn).toBe(true);
    await failTimes(server, 4, '127.0.0.5', () => email);
    expect((await signInFrom(server, '127.0.0.5', email, DEMO.password)).signedIn).toBe(true);
    await failTimes(server, 4, '127.0.0.5', () => email);
    expect((await signInFrom(server, '127.0.0.5', email, DEMO.password)).signedIn).toBe(true);
  });

  it('holds an address after fifty failures on any accounts, and only that address', async () => {
    await failTimes(server, 50, '127.0.0.6', (i) => `nobody-${i}@larkfield.example`);
    const held = await signInFrom(server, '127.0.0.6', DEMO.tomas, DEMO.password);
    expect(held.code).toBe('throttled');
    expect((await signInFrom(server, '127.0.0.7', DEMO.tomas, DEMO.password)).signedIn).toBe(true);
  });

  it('ignores a spoofed X-Forwarded-For when no proxy is trusted: the socket address is held', async () => {
    const email = 'spoofer.target@larkfield.example';
    await addAccount(server, email);
    for (let i = 0; i < 5; i++) {
      const r = await signInFrom(server, '127.0.0.8', email, `wrong-${i}-password`, {
        'X-Forwarded-For': `198.51.100.${i + 1}`,
      });
      expect(r.code).toBe('credentials');
    }
    const held = await signInFrom(server, '127.0.0.8', email, DEMO.password, { 'X-Forwarded-For': '198.51.100.99' });
    expect(held.code).toBe('throttled');
  });

  it('behind a trusted proxy (TRUST_PROXY=1) counts the address the proxy appended, not the one the client wrote', async () => {
    const proxied = await startServer({ env: { TRUST_PROXY: '1' } });
    try {
      const email = 'behind.proxy@larkfield.example';
      await addAccount(proxied, email);
      for (let i = 0; i < 5; i++) {
        const r = await signInFrom(proxied, '127.0.0.1', email, `wrong-${i}-password`, {
          'X-Forwarded-For': `203.0.113.${i + 1}, 192.0.2.10`,
        });
        expect(r.code).toBe('credentials');
      }
      const held = await signInFrom(proxied, '127.0.0.1', email, DEMO.password, {
        'X-Forwarded-For': '203.0.113.77, 192.0.2.10',
      });
      expect(held.code).toBe('throttled');
      const other = await signInFrom(proxied, '127.0.0.1', email, DEMO.password, { 'X-Forwarded-For': '192.0.2.11' });
      expect(other.signedIn).toBe(true);
    } finally {
      await proxied.stop();
    }
  });

  it('keeps its counts in the database, not in the server’s memory', async () => {
    const k = knexFactory(sqliteOptions(server.dbFile));
    try {
      const rows = await k('signin_limits').where('key', 'like', 'pair:held.pair@larkfield.example|%');
      expect(rows).toHaveLength(1);
      expect(rows[0]!.points).toBeGreaterThanOrEqual(5);
    } finally {
      await k.destroy();
    }
  });
});

describe('the sign-in form’s size', () => {
  const post = (body: string) =>
    fetch(`${server.baseUrl}/api/auth/callback/credentials`, {
      method: 'POST',
      redirect: 'manual',
      headers: { 'Content-Type': 'application/x-www-form-urlencoded', Origin: server.baseUrl },
      body,
    });

  it('answers a body over 4 KB with 413, before reading more or hashing', async () => {
    expect((await post(`email=${'a'.repeat(4100)}&password=x`)).status).toBe(413);
    expect((await post(`email=${'a'.repeat(8 * 1024 * 1024)}@x.example&password=x`)).status).toBe(413);
    // The server is still there and still signs people in.
    await expect(apiSignIn(server.baseUrl, DEMO.helen, DEMO.password)).resolves.toBeDefined();
  });

  it.each([
    ['an e-mail over 254 characters', { email: `${'a'.repeat(250)}@x.example`, password: 'whatever-password' }],
    ['a password over 200 characters', { email: DEMO.mira, password: 'p'.repeat(201) }],
  ])('sends %s back to the sign-in page with a message', async (_what, fields) => {
    const r = await signInFrom(server, '127.0.0.9', fields.email, fields.password);
    expect(r.code).toBe('too-long');
    const page = await fetch(`${server.baseUrl}/signin?code=too-long`);
    expect(await page.text()).toContain('longer than any account can have');
  });

  it('gives the form’s inputs the same limits', async () => {
    const html = await (await fetch(`${server.baseUrl}/signin`)).text();
    expect(html).toMatch(/name="email"[^>]*maxlength="254"/);
    expect(html).toMatch(/name="password"[^>]*maxlength="200"/);
  });
});

describe('Auth.js actions we do not use', () => {
  it.each([
    ['GET', '/api/auth/signin'],
    ['GET', '/api/auth/signout'],
    ['GET', '/api/auth/callback/credentials'],
    ['GET', '/api/auth/verify-request'],
    ['GET', '/api/auth/error'],
    ['POST', '/api/auth/signin/credentials'],
    ['POST', '/api/auth/session'],
    ['GET', '/api/auth/no-such-action'],
  ])('%s %s answers 404', async (method, path) => {
    const res = await fetch(server.baseUrl + path, {
      method,
      redirect: 'manual',
      headers: method === 'POST' ? { 'Content-Type': 'application/x-www-form-urlencoded', Origin: server.baseUrl } : {},
      body: method === 'POST' ? '' : undefined,
    });
    expect(res.status).toBe(404);
  });
});
