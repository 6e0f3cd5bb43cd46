// Sessions live on the server: sign-out ends this device's session only, "sign out
// everywhere" and deactivation end all of them, re-activation revives none, Auth.js's own
// sign-out ends the session too, and a password change ends the user's other sessions.
import knexFactory from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import { setActive } from '../../src/lib/server/sessions';
import { hashPassword } from '../../src/lib/server/users';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
beforeAll(async () => {
  server = await startServer();
});
afterAll(async () => {
  await server?.stop();
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
      .insert({ email, name: 'Session Tester', role: 'student', password_hash: await hashPassword(password) })
      .returning('id');
    return row!.id;
  });
}

const formPost = (api: ApiClient, path: string, body: string) =>
  api.fetch(path, {
    method: 'POST',
    headers: { Origin: server.baseUrl, 'Content-Type': 'application/x-www-form-urlencoded' },
    body,
  });

const meStatus = async (cookie: string) =>
  (await fetch(`${server.baseUrl}/api/me`, { headers: { Cookie: cookie } })).status;

describe('signing out', () => {
  it('ends this device’s session only', async () => {
    const email = 'two.devices@larkfield.example';
    await addAccount(email);
    const tablet = await apiSignIn(server.baseUrl, email, DEMO.password);
    const desk = await apiSignIn(server.baseUrl, email, DEMO.password);
    const tabletCookie = tablet.cookie;
    expect((await formPost(tablet, '/signout', 'scope=here')).status).toBe(303);
    expect(await meStatus(tabletCookie)).toBe(401);
    expect(await meStatus(desk.cookie)).toBe(200);
  });

  it('“sign out everywhere” ends every session of the user', async () => {
    const email = 'everywhere@larkfield.example';
    await addAccount(email);
    const a = await apiSignIn(server.baseUrl, email, DEMO.password);
    const b = await apiSignIn(server.baseUrl, email, DEMO.password);
    const [ca, cb] = [a.cookie, b.cookie];
    expect((await formPost(a, '/signout', 'scope=everywhere')).status).toBe(303);
    expect(await meStatus(ca)).toBe(401);
    expect(await meStatus(cb)).toBe(401);
  });

  it('through Auth.js’s own sign-out ends the session on the server, not only the cookie', async () => {
    const email = 'authjs.out@larkfield.example';
    await addAccount(email);
    const api = await apiSignIn(server.baseUrl, email, DEMO.password);
    const stolen = api.cookie;
    const csrf = (await (await api.fetch('/api/auth/csrf')).json()) as { csrfToken: string };
    const out = await formPost(api, '/api/auth/signout', new URLSearchParams({ csrfToken: csrf.csrfToken }).toString());
    expect([302, 303]).toContain(out.status);
    expect(await meStatus(stolen)).toBe(401);
  });

  it('answers an ended session as signed out at /api/auth/session, never cached', async () => {
    const email = 'session.read@larkfield.example';
    await addAccount(email);
    const api = await apiSignIn(server.baseUrl, email, DEMO.password);
    const cookie = api.cookie;
    const live = await fetch(`${server.baseUrl}/api/auth/session`, { headers: { Cookie: cookie } });
    expect(live.headers.get('cache-control')).toBe('no-store');
    expect(await live.json()).toMatchObject({ user: { email } });
    await formPost(api, '/signout', 'scope=here');
    const ended = await fetch(`${server.baseUrl}/api/auth/session`, { headers: { Cookie: cookie } });
    expect(ended.headers.get('cache-control')).toBe('no-store');
    expect(await ended.json()).toBeNull();
  });
});

describe('setActive', () => {
  it('ends every session on deactivation, and re-activation revives none of them', async () => {
    const email = 'set.active@larkfield.example';
    const id = await addAccount(email);
    const api = await apiSignIn(server.baseUrl, email, DEMO.password);
    const cookie = api.cookie;
    await withDb((k) => setActive(k, id, false, null));
    expect(await meStatus(cookie)).toBe(401);
    await expect(apiSignIn(server.baseUrl, email, DEMO.password)).rejects.toThrow(/sign-in failed/);
    await withDb((k) => setActive(k, id, true, null));
    expect(await meStatus(cookie)).toBe(401);
    await expect(apiSignIn(server.baseUrl, email, DEMO.password)).resolves.toBeDefined();
    const audit = await withDb((k) =>
      k('audit_log')
        .where({ subject_type: 'user', subject_id: String(id) })
        .pluck('action'),
    );
    expect(audit).toEqual(expect.arrayContaining(['user.deactivated', 'user.reactivated']));
  });
});

describe('changing one’s own password', () => {
  const change = (api: ApiClient, body: Record<string, unknown>) => api.post('/api/me/password', body);

  it('needs the current password and says which field is wrong', async () => {
    const email = 'wrong.current@larkfield.example';
    await addAccount(email);
    const api = await apiSignIn(server.baseUrl, email, DEMO.password);
    const res = await change(api, {
      id: 'req-wrong-current-1',
      currentPassword: 'not-my-password',
      newPassword: 'a-brand-new-passphrase',
    });
    expect(res.status).toBe(400);
    expect(await res.json()).toMatchObject({ field: 'currentPassword' });
  });

  it('refuses a password that breaks the policy, naming the field', async () => {
    const email = 'weak.new@larkfield.example';
    await addAccount(email);
    const api = await apiSignIn(server.baseUrl, email, DEMO.password);
    const res = await change(api, { id: 'req-weak-new-1', currentPassword: DEMO.password, newPassword: 'short' });
    expect(res.status).toBe(400);
    expect(await res.json()).toMatchObject({ field: 'newPassword' });
  });

  it('sets it, ends the user’s other sessions and keeps this one', async () => {
    const email = 'new.password@larkfield.example';
    await addAccount(email);
    const here = await apiSignIn(server.baseUrl, email, DEMO.password);
    const other = await apiSignIn(server.baseUrl, email, DEMO.password);
    const body = { id: 'req-change-ok-1', currentPassword: DEMO.password, newPassword: 'grey-heron-over-the-marsh' };
    const res = await change(here, body);
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ changed: true, otherSessionsEnded: 1 });
    expect(await meStatus(here.cookie)).toBe(200);
    expect(await meStatus(other.cookie)).toBe(401);
    await expect(apiSignIn(server.baseUrl, email, DEMO.password)).rejects.toThrow(/sign-in failed/);
    await expect(apiSignIn(server.baseUrl, email, body.newPassword)).resolves.toBeDefined();

    // The same id again gets the first answer; the same id with another body, 409.
    const again = await change(here, body);
    expect(again.status).toBe(200);
    expect(await again.json()).toEqual({ changed: true, otherSessionsEnded: 1 });
    const reused = await change(here, { ...body, newPassword: 'another-one-entirely-new' });
    expect(reused.status).toBe(409);
  });

  it('refuses a request from another site, and one that is not JSON', async () => {
    const email = 'cross.site@larkfield.example';
    await addAccount(email);
    const api = await apiSignIn(server.baseUrl, email, DEMO.password);
    const body = { id: 'req-cross-1', currentPassword: DEMO.password, newPassword: 'grey-heron-over-the-marsh' };
    expect(
      (await api.post('/api/me/password', body, { headers: { Origin: 'https://elsewhere.example' } })).status,
    ).toBe(403);
    expect((await api.post('/api/me/password', body, { headers: { 'Content-Type': 'text/plain' } })).status).toBe(415);
  });
});
