import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { beforeEach, describe, expect, it } from 'vitest';
import type { LogEvent } from '../../../src/lib/rules/index';
import { closeDb } from '../../../src/lib/client/db';
import { listEvents, listQueued, listServerCanals, putEvent } from '../../../src/lib/client/outbox';
import { backoffMs, syncOnce, toBatches, type SyncDeps } from '../../../src/lib/client/sync';

let n = 0;
function event(): LogEvent {
  n += 1;
  return {
    id: `ev-${n}`,
    caseId: 'case-1',
    canalId: 'canal-1',
    type: 'seat.checked',
    at: new Date().toISOString(),
    data: {},
  } as unknown as LogEvent;
}

beforeEach(async () => {
  await closeDb();
  globalThis.indexedDB = new IDBFactory();
});

describe('syncOnce', () => {
  it('sends nothing, and asks the server nothing, when the outbox is empty', async () => {
    const sent: LogEvent[][] = [];
    const out = await syncOnce(1, 'tablet-1', {
      post: async (_d, e) => {
        sent.push(e);
        return { kind: 'offline', error: '' };
      },
    });
    expect(out).toMatchObject({ kind: 'done', sent: 0 });
    expect(sent).toEqual([]);
  });

  it("names the outbox's owner in every batch, and stops with the outbox intact when the server says the session is someone else's", async () => {
    for (let i = 0; i < 2; i++) await putEvent(1, event());
    const owners: number[] = [];
    const out = await syncOnce(1, 'tablet-1', {
      post: async (_d, _e, userId) => {
        owners.push(userId);
        return { kind: 'status', status: 403, error: 'These events belong to another account', code: 'other-user' };
      },
    });
    expect(owners).toEqual([1]);
    expect(out).toEqual({ kind: 'other-user' });
    expect(await listQueued(1)).toHaveLength(2);
  });

  it('does not send for ever a withdrawal of an answer the server refused', async () => {
    const bad = event();
    await putEvent(1, bad);
    await syncOnce(1, 'tablet-1', {
      post: async () => ({
        kind: 'ok',
        value: {
          contractVersion: 1,
          results: [{ id: bad.id, status: 'rejected', error: 'depthMm must be a multiple of 0.5 mm' }],
          canals: [],
        },
      }),
    });
    const undo = { ...event(), type: 'event.voided', data: { eventId: bad.id, reason: 'undo' } } as unknown as LogEvent;
    await putEvent(1, undo);
    const sent: string[] = [];
    await syncOnce(1, 'tablet-1', {
      post: async (_d, batch) => {
        sent.push(...batch.map((e) => e.id));
        return { kind: 'ok', value: { contractVersion: 1, results: [], canals: [] } };
      },
    });
    expect(sent).toEqual([]);
    const row = (await listEvents(1)).find((r) => r.event.id === undo.id);
    expect(row).toMatchObject({ state: 'rejected' });
  });

  it('keeps the outbox intact when the network drops mid-sync', async () => {
    for (let i = 0; i < 3; i++) await putEvent(1, event());
    const out = await syncOnce(1, 'tablet-1', {
      post: async () => ({ kind: 'offline', error: 'Failed to fetch' }),
    });
    expect(out).toEqual({ kind: 'offline' });
    expect(await listQueued(1)).toHaveLength(3);
  });

  it("sends in recording order, applies results and keeps the server's verdicts", async () => {
    const evs = [event(), event(), event()];
    for (const e of evs) await putEvent(1, e);
    let got: string[] = [];
    const out = await syncOnce(1, 'tablet-1', {
      post: async (_d, batch) => {
        got = batch.map((e) => e.id);
        return {
          kind: 'ok',
          value: {
            contractVersion: 1,
            results: [
              { id: batch[0]!.id, status: 'stored' },
              { id: batch[1]!.id, status: 'duplicate' },
              { id: batch[2]!.id, status: 'rejected', error: 'bad length' },
            ],
            canals: [{ canalId: 'canal-1', caseId: 'case-1', state: {} as never, findings: [] }],
          },
        };
      },
    });
    expect(got).toEqual(evs.map((e) => e.id));
    expect(out).toMatchObject({ kind: 'done', sent: 3, stored: 2, rejected: 1 });
    expect(await listQueued(1)).toEqual([]);
    expect((await listEvents(1)).map((r) => r.state)).toEqual(['synced', 'synced', 'rejected']);
    expect(await listServerCanals(1)).toHaveLength(1);
  });

  it('halves a batch the server finds too large', async () => {
    for (let i = 0; i < 4; i++) await putEvent(1, event());
    const sizes: number[] = [];
    await syncOnce(1, 'tablet-1', {
      post: async (_d, batch) => {
        sizes.push(batch.length);
        if (batch.length > 2) return { kind: 'status', status: 413 };
        return {
          kind: 'ok',
          value: {
            contractVersion: 1,
            results: batch.map((e) => ({ id: e.id, status: 'stored' as const })),
            canals: [],
          },
        };
      },
    });
    expect(sizes).toEqual([4, 2, 2]);
    expect(await listQueued(1)).toEqual([]);
  });
});

describe('syncOnce, the retry cap', () => {
  it('stops sending an event the server has asked for again for 7 days, by the clock it is given', async () => {
    const e = event();
    await putEvent(1, e);
    let clock = new Date('2026-12-02T09:00:00.000Z');
    const sent: string[] = [];
    const deps: SyncDeps = {
      now: () => clock,
      post: async (_d, batch) => {
        sent.push(...batch.map((x) => x.id));
        return {
          kind: 'ok',
          value: {
            contractVersion: 1,
            results: batch.map((x) => ({
              id: x.id,
              status: 'rejected' as const,
              error: 'the case of this event is not on the server yet; it will be sent again',
              retry: true,
            })),
            canals: [],
          },
        };
      },
    };
    await syncOnce(1, 'tablet-1', deps);
    clock = new Date(clock.getTime() + 7 * 24 * 3600 * 1000);
    await syncOnce(1, 'tablet-1', deps);
    await syncOnce(1, 'tablet-1', deps);
    expect(sent).toEqual([e.id, e.id]);
    expect((await listEvents(1))[0]).toMatchObject({ state: 'rejected', retries: 2 });
  });
});

describe('toBatches', () => {
  it('cuts the outbox into batches of at most 500 events', () => {
    const rows = Array.from({ length: 1201 }, () => ({
      kind: 'event' as const,
      userId: 1,
      event: event(),
      seq: 0,
      state: 'queued' as const,
    }));
    expect(toBatches(rows).map((b) => b.length)).toEqual([500, 500, 201]);
  });
  it('cuts by size too', () => {
    const rows = Array.from({ length: 10 }, () => ({
      kind: 'event' as const,
      userId: 1,
      event: event(),
      seq: 0,
      state: 'queued' as const,
    }));
    expect(toBatches(rows, 500, 400).length).toBeGreaterThan(1);
  });
});

describe('backoffMs', () => {
  it('doubles from 2 s and stops at 5 minutes', () => {
    const mid = () => 0.5;
    expect([0, 1, 2, 3, 20].map((f) => backoffMs(f, mid))).toEqual([0, 2000, 4000, 8000, 300000]);
  });
});
