import { promisifyRequest, type UseStore } from 'idb-keyval';

/**
 * One IndexedDB database for the chairside island, with three object stores:
 * - `events`: every event this tablet knows, keyed `[userId, eventId]` (the outbox is the
 *   subset still `queued`);
 * - `server`: the server's latest CanalResult per canal, keyed `[userId, canalId]`;
 * - `meta`: device id, last signed-in user, small per-user flags.
 * idb-keyval's own createStore holds one store per database, so we open ours here and
 * hand idb-keyval a custom UseStore (which also lets writes ask for strict durability).
 */
const DB_NAME = 'coneline-chairside';
// 1: events, server, meta. 2: every `events` row carries `kind` ('event'; image blobs later).
const DB_VERSION = 2;
export const STORES = ['events', 'server', 'meta'] as const;
export type StoreName = (typeof STORES)[number];

let dbp: Promise<IDBDatabase> | null = null;

function openDb(): Promise<IDBDatabase> {
  if (!dbp) {
    const req = indexedDB.open(DB_NAME, DB_VERSION);
    req.onupgradeneeded = (ev) => {
      for (const name of STORES) {
        if (!req.result.objectStoreNames.contains(name)) req.result.createObjectStore(name);
      }
      // In the upgrade transaction itself: the database opens only once every row is marked,
      // so no code of this version ever sees an outbox row without its kind.
      if (ev.oldVersion >= 1 && ev.oldVersion < 2 && req.transaction)
        markEventRows(req.transaction.objectStore('events'));
    };
    dbp = promisifyRequest(req).then((db) => {
      // Another tab upgrading or deleting the database: let go so it can proceed.
      db.onversionchange = () => {
        db.close();
        dbp = null;
      };
      return db;
    });
    dbp.catch(() => {
      dbp = null;
    });
  }
  return dbp;
}

/** Version 1 rows were all events and had no `kind`: say so on each (unsent ones included). */
function markEventRows(store: IDBObjectStore): void {
  const cursor = store.openCursor();
  cursor.onsuccess = () => {
    const c = cursor.result;
    if (!c) return;
    const row = c.value as Record<string, unknown> | undefined;
    if (row && row.kind === undefined) c.update({ ...row, kind: 'event' });
    c.continue();
  };
}

/**
 * A UseStore for one of our object stores. `strict` asks Chromium to flush the write to
 * disk before the transaction completes (by default it reports writes done
 * earlier) — used for the outbox, whose writes must survive a power cut.
 */
export function useStore(name: StoreName, strict = false): UseStore {
  return (txMode, callback) =>
    openDb().then((db) =>
      callback(
        db
          .transaction(name, txMode, strict && txMode === 'readwrite' ? { durability: 'strict' } : undefined)
          .objectStore(name),
      ),
    );
}

/** Key range holding every `[userId, …]` key of one user. */
export function userRange(userId: number): IDBKeyRange {
  // Arrays sort after every number and string, so [userId, []] bounds [userId, anyString].
  return IDBKeyRange.bound([userId], [userId, []]);
}

/** Close and forget the connection (tests reset fake-indexeddb between cases). */
export async function closeDb(): Promise<void> {
  if (dbp) {
    const db = await dbp.catch(() => null);
    db?.close();
    dbp = null;
  }
}
