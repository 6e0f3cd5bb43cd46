import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { beforeEach, describe, expect, it } from 'vitest';
import type { LogEvent } from '../../../src/lib/rules/core';
import { closeDb } from '../../../src/lib/client/db';
import { listEvents, listQueued, listRows } from '../../../src/lib/client/outbox';
import { syncOnce } from '../../../src/lib/client/sync';

const event = (n: number): LogEvent =>
  ({
    id: `ev-${n}`,
    caseId: 'case-1',
    canalId: 'canal-1',
    type: 'seat.checked',
    at: new Date(Date.UTC(2026, 11, 2, 9, 0, n)).toISOString(),
    data: {},
  }) as unknown as LogEvent;

/** Writes the database as the previous version of the island left it: version 1, rows without `kind`. */
function writeVersion1(rows: { key: IDBValidKey; value: unknown }[]): Promise<void> {
  return new Promise((resolve, reject) => {
    const req = indexedDB.open('coneline-chairside', 1);
    req.onupgradeneeded = () => {
      for (const name of ['events', 'server', 'meta']) req.result.createObjectStore(name);
    };
    req.onerror = () => reject(req.error);
    req.onsuccess = () => {
      const tx = req.result.transaction('events', 'readwrite');
      for (const r of rows) tx.objectStore('events').put(r.value, r.key);
      tx.oncomplete = () => {
        req.result.close();
        resolve();
      };
      tx.onerror = () => reject(tx.error);
    };
  });
}

beforeEach(async () => {
  await closeDb();
  globalThis.indexedDB = new IDBFactory();
});

describe('the outbox after the IndexedDB upgrade to version 2', () => {
  it('marks every old row as an event, and an unsent one still syncs', async () => {
    const [queued, synced] = [event(1), event(2)];
    await writeVersion1([
      { key: [4, queued.id], value: { userId: 4, event: queued, seq: 1, state: 'queued' } },
      { key: [4, synced.id], value: { userId: 4, event: synced, seq: 2, state: 'synced' } },
    ]);

    expect((await listRows(4)).map((r) => r.kind)).toEqual(['event', 'event']);
    expect((await listQueued(4)).map((r) => r.event.id)).toEqual([queued.id]);

    const sent: string[] = [];
    const out = await syncOnce(4, 'tablet-1', {
      post: async (_d, batch, userId) => {
        expect(userId).toBe(4);
        sent.push(...batch.map((e) => e.id));
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
    expect(out).toMatchObject({ kind: 'done', sent: 1, stored: 1 });
    expect(sent).toEqual([queued.id]);
    expect((await listEvents(4)).map((r) => r.state)).toEqual(['synced', 'synced']);
  });
});
