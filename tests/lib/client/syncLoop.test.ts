import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { closeDb } from '../../../src/lib/client/db';
import { listServerCanals, putEvent } from '../../../src/lib/client/outbox';
import type { PullOutcome } from '../../../src/lib/client/sync';
import { SyncLoop, type SyncLoopOptions } from '../../../src/lib/client/syncLoop';
import type { LogEvent } from '../../../src/lib/rules/core';

const CASE = '0b6f1a52-8d3e-4c1a-9f11-5a2b7c9d0e01';
const canal = { canalId: 'canal-1', caseId: CASE, state: { status: 'filled' }, findings: [] };

let fetchSpy: ReturnType<typeof vi.fn<typeof fetch>>;
let openSpy: ReturnType<typeof vi.spyOn>;
let loop: SyncLoop | null = null;

beforeEach(async () => {
  await closeDb();
  globalThis.indexedDB = new IDBFactory();
  // Timers and the clock only: fake-indexeddb runs its requests on setImmediate.
  vi.useFakeTimers({ toFake: ['setTimeout', 'clearTimeout', 'setInterval', 'clearInterval', 'Date'] });
  fetchSpy = vi.fn<typeof fetch>();
  vi.stubGlobal('fetch', fetchSpy);
  vi.stubGlobal('navigator', { onLine: true });
  vi.stubGlobal('window', { addEventListener: vi.fn(), removeEventListener: vi.fn() });
  openSpy = vi.spyOn(globalThis.indexedDB, 'open');
});
afterEach(() => {
  loop?.stop();
  loop = null;
  vi.useRealTimers();
  vi.unstubAllGlobals();
  vi.restoreAllMocks();
});

function startLoop(over: Partial<SyncLoopOptions>): SyncLoop {
  loop = new SyncLoop({
    deviceId: 'tablet-1',
    userId: () => 1,
    pending: () => 0,
    pullCaseId: () => null,
    onStatus: () => {},
    onOutcome: () => {},
    pullEveryMs: () => 45_000,
    ...over,
  });
  loop.start();
  return loop;
}

/** Lets IndexedDB and fetch promises settle while the fake clock stands still. */
async function settle() {
  for (let i = 0; i < 20; i++) await new Promise((r) => setImmediate(r));
}

const urls = () => fetchSpy.mock.calls.map(([url]) => String(url));
const sentTag = (call: number) =>
  new Headers((fetchSpy.mock.calls[call]?.[1] as RequestInit | undefined)?.headers).get('if-none-match');

describe('SyncLoop, idle', () => {
  it('holds no timer, sends no request and reads no IndexedDB with nothing queued and no case open', async () => {
    startLoop({});
    await settle();
    await vi.advanceTimersByTimeAsync(30 * 60_000);
    await settle();
    expect(vi.getTimerCount()).toBe(0);
    expect(fetchSpy).not.toHaveBeenCalled();
    expect(openSpy).not.toHaveBeenCalled();
  });

  it('drops its timer when the case is closed and nothing is queued', async () => {
    let open: string | null = CASE;
    fetchSpy.mockImplementation(async () => new Response(null, { status: 304, headers: { ETag: '"v1"' } }));
    const l = startLoop({ pullCaseId: () => open });
    await settle();
    expect(vi.getTimerCount()).toBe(1);
    open = null;
    l.poke();
    expect(vi.getTimerCount()).toBe(0);
    await vi.advanceTimersByTimeAsync(10 * 60_000);
    expect(fetchSpy).toHaveBeenCalledTimes(1);
  });
});

describe('SyncLoop, pulling the open case', () => {
  it('asks every 30-60 s with If-None-Match, merges a changed case and never calls /api/me', async () => {
    const pulled: PullOutcome[] = [];
    let answer = 0;
    fetchSpy.mockImplementation(async () => {
      answer++;
      if (answer === 2) return new Response(null, { status: 304, headers: { ETag: '"v1"' } });
      const tag = answer === 1 ? '"v1"' : '"v2"';
      const body = { caseId: CASE, reviewStatus: answer === 1 ? 'submitted' : 'returned', events: [], canals: [canal] };
      return Response.json(body, { headers: { ETag: tag } });
    });
    startLoop({ pullCaseId: () => CASE, onPulled: (_c, o) => pulled.push(o) });
    await settle();
    expect(urls()).toEqual([`/api/cases/${CASE}`]);
    expect(sentTag(0)).toBeNull();
    expect(await listServerCanals(1)).toEqual([expect.objectContaining({ result: canal })]);

    await vi.advanceTimersByTimeAsync(44_000);
    expect(fetchSpy).toHaveBeenCalledTimes(1);
    await vi.advanceTimersByTimeAsync(1_000);
    await settle();
    expect(fetchSpy).toHaveBeenCalledTimes(2);
    expect(sentTag(1)).toBe('"v1"');

    await vi.advanceTimersByTimeAsync(45_000);
    await settle();
    expect(sentTag(2)).toBe('"v1"');
    expect(pulled).toEqual([
      { kind: 'changed', etag: '"v1"', reviewStatus: 'submitted' },
      { kind: 'unchanged' },
      { kind: 'changed', etag: '"v2"', reviewStatus: 'returned' },
    ]);
    expect(urls().some((u) => u.includes('/api/me'))).toBe(false);
  });

  it('sends queued events first, then pulls, in one pass', async () => {
    const event = {
      id: 'ev-1',
      caseId: CASE,
      canalId: 'canal-1',
      type: 'seat.checked',
      at: new Date().toISOString(),
      data: {},
    } as unknown as LogEvent;
    await putEvent(1, event);
    let queued = 1;
    fetchSpy.mockImplementation(async (url) => {
      if (String(url) === '/api/sync') {
        queued = 0;
        return Response.json({ results: [{ id: 'ev-1', status: 'stored' }], canals: [] });
      }
      return new Response(null, { status: 304 });
    });
    startLoop({ pending: () => queued, pullCaseId: () => CASE });
    await settle();
    expect(urls()).toEqual(['/api/sync', `/api/cases/${CASE}`]);
  });
});
