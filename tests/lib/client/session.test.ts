import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { LogEvent } from '../../../src/lib/rules/index';
import { closeDb } from '../../../src/lib/client/db';
import { applyResults, getMeta, listEvents, putEvent } from '../../../src/lib/client/outbox';
import { deviceId, leave, resolveIdentity } from '../../../src/lib/client/session';

const mira = { id: 11, name: 'Mira Okafor', role: 'student' as const };
const tomas = { id: 12, name: 'Tomas Lindqvist', role: 'student' as const };

function answer(status: number, body: unknown) {
  return vi.fn(
    async () => new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } }),
  );
}
const offline = vi.fn(async () => {
  throw new TypeError('Failed to fetch');
});
let n = 0;
const event = () =>
  ({
    id: `ev-${++n}`,
    caseId: 'c',
    canalId: 'k',
    type: 'seat.checked',
    at: new Date().toISOString(),
    data: {},
  }) as unknown as LogEvent;

beforeEach(async () => {
  await closeDb();
  globalThis.indexedDB = new IDBFactory();
});
afterEach(() => {
  vi.unstubAllGlobals();
});

describe('resolveIdentity', () => {
  it('keeps the signed-in user so the tablet works offline as them later', async () => {
    vi.stubGlobal('fetch', answer(200, mira));
    expect(await resolveIdentity()).toEqual({
      user: mira,
      source: 'server',
      signedOut: false,
      demo: false,
      serverContract: 1,
    });
    vi.stubGlobal('fetch', offline);
    expect(await resolveIdentity()).toEqual({
      user: mira,
      source: 'tablet',
      signedOut: false,
      demo: false,
      serverContract: 1,
    });
  });

  it('keeps the clinic’s time zone and locale with the user, so times show in the clinic’s zone offline', async () => {
    const clinic = { timeZone: 'Pacific/Auckland', locale: 'en-NZ' };
    vi.stubGlobal('fetch', answer(200, { ...mira, clinic }));
    expect((await resolveIdentity()).user).toEqual({ ...mira, clinic });
    vi.stubGlobal('fetch', offline);
    expect(await resolveIdentity()).toMatchObject({ user: { ...mira, clinic }, source: 'tablet' });
  });

  it('keeps demo mode as the server last said it, offline and after a sign-out, until the server says otherwise', async () => {
    vi.stubGlobal('fetch', answer(200, { ...mira, demo: true }));
    expect((await resolveIdentity()).demo).toBe(true);
    vi.stubGlobal('fetch', offline);
    expect(await resolveIdentity()).toEqual({
      user: mira,
      source: 'tablet',
      signedOut: false,
      demo: true,
      serverContract: 1,
    });
    vi.stubGlobal('fetch', answer(401, { error: 'Sign in first.' }));
    expect(await resolveIdentity()).toEqual({
      user: null,
      source: null,
      signedOut: true,
      demo: true,
      serverContract: 1,
    });
    vi.stubGlobal('fetch', answer(200, { ...tomas, demo: false }));
    expect((await resolveIdentity()).demo).toBe(false);
    vi.stubGlobal('fetch', offline);
    expect((await resolveIdentity()).demo).toBe(false);
  });

  it("clears the previous user's data when someone else signs in and all of it was sent", async () => {
    vi.stubGlobal('fetch', answer(200, mira));
    await resolveIdentity();
    const e = event();
    await putEvent(mira.id, e);
    await applyResults(mira.id, [{ id: e.id, status: 'stored' }]);
    vi.stubGlobal('fetch', answer(200, tomas));
    await resolveIdentity();
    expect(await listEvents(mira.id)).toEqual([]);
  });

  it("keeps the previous user's unsent events untouched when someone else signs in", async () => {
    vi.stubGlobal('fetch', answer(200, mira));
    await resolveIdentity();
    await putEvent(mira.id, event());
    vi.stubGlobal('fetch', answer(200, tomas));
    expect((await resolveIdentity()).user).toEqual(tomas);
    expect((await listEvents(mira.id)).map((r) => r.state)).toEqual(['queued']);
  });

  it('works as nobody after the server says nobody is signed in', async () => {
    vi.stubGlobal('fetch', answer(200, mira));
    await resolveIdentity();
    vi.stubGlobal('fetch', answer(401, { error: 'Sign in first.' }));
    expect(await resolveIdentity()).toEqual({
      user: null,
      source: null,
      signedOut: true,
      demo: false,
      serverContract: 1,
    });
    vi.stubGlobal('fetch', offline);
    expect((await resolveIdentity()).user).toBeNull();
  });
});

describe('leave', () => {
  it('warns with the unsent count and keeps the events', async () => {
    await putEvent(mira.id, event());
    expect(await leave(mira.id, 1)).toBe(1);
    expect(await listEvents(mira.id)).toHaveLength(1);
    expect(await getMeta('lastUser')).toBeUndefined();
  });
});

describe('deviceId', () => {
  it('makes one id per browser and keeps it', async () => {
    const first = await deviceId();
    expect(first).toMatch(/^tablet-[0-9a-f]{12}$/);
    expect(await deviceId()).toBe(first);
  });
});

describe('the server’s contract version', () => {
  it('is kept from /api/me, offline too, and read as 1 from a server that reports none', async () => {
    const { resolveIdentity: resolve } = await import('../../../src/lib/client/session');
    const answer = (body: Record<string, unknown>) =>
      vi.fn(
        async () =>
          new Response(JSON.stringify(body), { status: 200, headers: { 'Content-Type': 'application/json' } }),
      );
    vi.stubGlobal('fetch', answer({ id: 21, name: 'Noor', role: 'student', demo: false, contractVersion: 3 }));
    expect((await resolve()).serverContract).toBe(3);
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => Promise.reject(new TypeError('offline'))),
    );
    expect((await resolve()).serverContract).toBe(3);
    vi.stubGlobal('fetch', answer({ id: 21, name: 'Noor', role: 'student', demo: false }));
    expect((await resolve()).serverContract).toBe(1);
    vi.unstubAllGlobals();
  });
});
