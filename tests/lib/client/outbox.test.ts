import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { beforeEach, describe, expect, it } from 'vitest';
import type { LogEvent } from '../../../src/lib/rules/index';
import { set } from 'idb-keyval';
import { closeDb, useStore } from '../../../src/lib/client/db';
import {
  applyResults,
  clearUserIfSynced,
  countQueued,
  dismissRejected,
  importSynced,
  listEvents,
  listQueued,
  listServerCanals,
  putEvent,
  putServerCanals,
  type StoredEvent,
} from '../../../src/lib/client/outbox';

let n = 0;
function event(caseId = 'case-1', type = 'seat.checked'): LogEvent {
  n += 1;
  return {
    id: `ev-${n}`,
    caseId,
    canalId: 'canal-1',
    type,
    at: new Date(Date.UTC(2026, 2, 2, 9, 0, n)).toISOString(),
    data: {},
  } as unknown as LogEvent;
}

beforeEach(async () => {
  await closeDb();
  globalThis.indexedDB = new IDBFactory();
});

describe('putEvent and listQueued', () => {
  it("keeps each user's events apart, in recording order", async () => {
    const a1 = event();
    const b1 = event();
    const a2 = event();
    await putEvent(1, a1);
    await putEvent(2, b1);
    await putEvent(1, a2);
    expect((await listQueued(1)).map((r) => r.event.id)).toEqual([a1.id, a2.id]);
    expect((await listQueued(2)).map((r) => r.event.id)).toEqual([b1.id]);
  });
});

describe('applyResults', () => {
  it('lets an event leave the outbox only when stored or duplicate', async () => {
    const [s, d, r, t] = [event(), event(), event(), event()];
    for (const e of [s, d, r, t]) await putEvent(7, e);
    await applyResults(7, [
      { id: s.id, status: 'stored' },
      { id: d.id, status: 'duplicate' },
      { id: r.id, status: 'rejected', error: 'depthMm must be a multiple of 0.5 mm' },
      { id: t.id, status: 'rejected', error: 'unknown canal', retry: true as const },
    ]);
    expect((await listQueued(7)).map((x) => x.event.id)).toEqual([t.id]);
    const rows = await listEvents(7);
    expect(rows.find((x) => x.event.id === r.id)).toMatchObject({
      state: 'rejected',
      error: 'depthMm must be a multiple of 0.5 mm',
    });
    expect(rows.find((x) => x.event.id === t.id)).toMatchObject({ state: 'queued', retries: 1 });
  });
});

describe('clearUserIfSynced', () => {
  it("keeps a user's data while anything is unsent and clears only that user after", async () => {
    const a = event();
    const b = event();
    await putEvent(1, a);
    await putEvent(2, b);
    await putServerCanals(1, [{ canalId: 'canal-1', caseId: 'case-1', state: {}, findings: [] } as never]);
    expect(await clearUserIfSynced(1)).toBe(false);
    expect(await countQueued(1)).toBe(1);
    await applyResults(1, [{ id: a.id, status: 'stored' }]);
    expect(await clearUserIfSynced(1)).toBe(true);
    expect(await listEvents(1)).toEqual([]);
    expect(await listServerCanals(1)).toEqual([]);
    expect(await countQueued(2)).toBe(1);
  });
});

describe('clearUserIfSynced with refused events', () => {
  it("keeps a user's data while a refused event waits to be read and dismissed", async () => {
    const a = event();
    await putEvent(4, a);
    await applyResults(4, [{ id: a.id, status: 'rejected', error: 'depthMm must be a multiple of 0.5 mm' }]);
    expect(await countQueued(4)).toBe(0);
    expect(await clearUserIfSynced(4)).toBe(false);
    await dismissRejected(4, a.id);
    expect(await clearUserIfSynced(4)).toBe(true);
  });
});

describe('importSynced', () => {
  it('keeps server events as synced without overwriting what the tablet recorded', async () => {
    const local = event();
    await putEvent(3, local);
    await importSynced(3, [local, event()]);
    const rows = await listEvents(3);
    expect(rows).toHaveLength(2);
    expect(rows.filter((r) => r.state === 'queued')).toHaveLength(1);
  });
});

describe('applyResults, the retry cap', () => {
  const DAY = 24 * 60 * 60 * 1000;
  const t0 = new Date('2026-12-02T09:00:00.000Z');
  const at = (ms: number) => new Date(t0.getTime() + ms);
  const retry = (id: string) => [
    {
      id,
      status: 'rejected' as const,
      error: 'the case of this event is not on the server yet; it will be sent again',
      retry: true as const,
    },
  ];

  it('keeps sending an event the server asks for again, and marks it refused 7 days after the first such answer', async () => {
    const e = event();
    await putEvent(8, e);
    await applyResults(8, retry(e.id), t0);
    await applyResults(8, retry(e.id), at(7 * DAY - 1));
    expect((await listEvents(8))[0]).toMatchObject({ state: 'queued', retries: 2, firstRetryAt: t0.toISOString() });
    await applyResults(8, retry(e.id), at(7 * DAY));
    const row = (await listEvents(8))[0]!;
    expect(row).toMatchObject({ state: 'rejected', retries: 3 });
    expect(row.error).toMatch(/^The server did not accept this after 7 days of retries/);
    expect(await listQueued(8)).toEqual([]);
  });

  it('starts the 7 days of a row kept before the cap at its next retry answer', async () => {
    const e = event();
    await set(
      [9, e.id],
      { kind: 'event', userId: 9, event: e, seq: 1, state: 'queued', retries: 40, error: 'old' } satisfies StoredEvent,
      useStore('events', true),
    );
    await applyResults(9, retry(e.id), at(30 * DAY));
    expect((await listEvents(9))[0]).toMatchObject({
      state: 'queued',
      retries: 41,
      firstRetryAt: at(30 * DAY).toISOString(),
    });
    await applyResults(9, retry(e.id), at(37 * DAY));
    expect((await listEvents(9))[0]!.state).toBe('rejected');
  });

  it('lets an event go through after retries as before', async () => {
    const e = event();
    await putEvent(10, e);
    await applyResults(10, retry(e.id), t0);
    await applyResults(10, [{ id: e.id, status: 'stored' }], at(8 * DAY));
    expect((await listEvents(10))[0]).toMatchObject({ state: 'synced', retries: 1 });
  });
});
