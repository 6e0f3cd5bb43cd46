import { get, set, del, promisifyRequest } from 'idb-keyval';
import type { CanalResult, LogEvent } from '../rules/core';
import { useStore, userRange } from './db';

/**
 * The tablet's event log, keyed by user. Every event the student records is written here
 * (strict durability) before the screen says "saved". An event stays `queued` — in the
 * outbox — until the server answers `stored` or `duplicate`; a plain rejection keeps it as
 * `rejected` with the server's reason so the student can see it, and so does a "send it again
 * later" (`retry: true`) still answered RETRY_CAP_DAYS after the first.
 */
export type EventState = 'queued' | 'synced' | 'rejected';

/** What every outbox row has, whatever it carries. */
interface OutboxRowBase {
  userId: number;
  /** Recording order on this tablet (the sync sends in this order). */
  seq: number;
  state: EventState;
  error?: string;
  /** How many times the server asked us to send it again later (`retry: true`). */
  retries?: number;
  /** When the server first asked that (ISO instant); absent on rows from before the cap. */
  firstRetryAt?: string;
}

/** An event, sent as JSON through POST /api/sync; keyed `[userId, event.id]`. */
export interface StoredEvent extends OutboxRowBase {
  kind: 'event';
  event: LogEvent;
}

/**
 * An image (a radiograph) waiting to be uploaded, with the id of the event that names it;
 * keyed `[userId, 'blob', blobId]` so it can never meet an event's key. Declared so the
 * outbox's shape holds it; nothing writes one yet (uploads come later).
 */
export interface StoredBlob extends OutboxRowBase {
  kind: 'blob';
  blobId: string;
  /** The `radiograph.taken` this image belongs to (sent first, as an event). */
  eventId: string;
  blob: Blob;
  contentType: string;
  bytes: number;
}

/** One row of the outbox store (`events`): since IndexedDB version 2 every row says its kind. */
export type OutboxRow = StoredEvent | StoredBlob;

/**
 * How long the tablet keeps sending an event the server keeps asking for again. An event
 * whose case never reaches the server (or whose ids someone else holds, which the server
 * answers the same way) would otherwise stay in the outbox, and block sign-out, for ever.
 */
export const RETRY_CAP_DAYS = 7;
const RETRY_CAP_MS = RETRY_CAP_DAYS * 24 * 60 * 60 * 1000;

import type { SyncResult } from '../contract';

export type { SyncResult };

const events = () => useStore('events', true);
const eventsRelaxed = () => useStore('events');
const server = () => useStore('server');
const meta = () => useStore('meta', true);

let lastSeq = 0;
/** Strictly increasing within this page, roughly time-ordered across reloads. */
function nextSeq(): number {
  lastSeq = Math.max(lastSeq + 1, Date.now() * 1000);
  return lastSeq;
}

/** Record one event for this user; resolves once it is durably on disk. */
export async function putEvent(userId: number, event: LogEvent): Promise<StoredEvent> {
  const row: StoredEvent = { kind: 'event', userId, event, seq: nextSeq(), state: 'queued' };
  await set([userId, event.id], row, events());
  return row;
}

/** Every outbox row of this user, of any kind, in recording order. */
export function listRows(userId: number): Promise<OutboxRow[]> {
  return eventsRelaxed()('readonly', (store) =>
    promisifyRequest(store.getAll(userRange(userId)) as IDBRequest<OutboxRow[]>),
  ).then((rows) => rows.sort((a, b) => a.seq - b.seq));
}

/** Every event of this user, in recording order. */
export async function listEvents(userId: number): Promise<StoredEvent[]> {
  return (await listRows(userId)).filter((r): r is StoredEvent => r.kind === 'event');
}

/** The outbox: this user's queued events in recording order, at most `limit`. */
export async function listQueued(userId: number, limit = Infinity): Promise<StoredEvent[]> {
  const rows = await listEvents(userId);
  return rows.filter((r) => r.state === 'queued').slice(0, limit);
}

export async function countQueued(userId: number): Promise<number> {
  return (await listQueued(userId)).length;
}

/** Apply the server's answers to the outbox in one strict transaction; `now` is the tablet's clock. */
export function applyResults(userId: number, results: SyncResult[], now: Date = new Date()): Promise<void> {
  return events()('readwrite', (store) => {
    for (const r of results) {
      // An answer without an id is for an event the tablet never sent in that shape.
      if (r.id === null) continue;
      const id = r.id;
      const req = store.get([userId, id]) as IDBRequest<StoredEvent | undefined>;
      req.onsuccess = () => {
        const row = req.result;
        if (!row) return;
        if (r.status === 'stored' || r.status === 'duplicate') {
          row.state = 'synced';
          delete row.error;
        } else if (r.status === 'rejected' && r.retry) {
          row.retries = (row.retries ?? 0) + 1;
          // A row kept before the cap existed starts its days at this answer.
          row.firstRetryAt ??= now.toISOString();
          const capped = now.getTime() - Date.parse(row.firstRetryAt) >= RETRY_CAP_MS;
          row.state = capped ? 'rejected' : 'queued';
          row.error = capped ? retryCapMessage(r.error) : r.error;
        } else {
          row.state = 'rejected';
          row.error = r.status === 'rejected' ? r.error : 'Rejected by the server';
        }
        store.put(row, [userId, id]);
      };
    }
    return promisifyRequest(store.transaction);
  });
}

function retryCapMessage(last: string | undefined): string {
  const answer = last ? ` Its last answer: ${last}.` : '';
  return `The server did not accept this after ${RETRY_CAP_DAYS} days of retries, so the tablet has stopped sending it.${answer} Show it to your attending, then dismiss it.`;
}

/**
 * A withdrawal (a void, a removed cone) of an event the server refused can never be stored:
 * the server would ask for it again forever. Mark such events refused here, with the reason.
 */
export async function refuseOrphans(userId: number): Promise<number> {
  const rows = await listEvents(userId);
  const refused = new Set(rows.filter((r) => r.state === 'rejected').map((r) => r.event.id));
  const orphans = rows.filter((r) => {
    const target = (r.event.data as { eventId?: unknown }).eventId;
    return r.state === 'queued' && typeof target === 'string' && refused.has(target);
  });
  if (orphans.length === 0) return 0;
  await events()('readwrite', (store) => {
    for (const row of orphans)
      store.put(
        { ...row, state: 'rejected', error: 'The answer it withdraws was refused, so there is nothing to withdraw.' },
        [userId, row.event.id],
      );
    return promisifyRequest(store.transaction);
  });
  return orphans.length;
}

/** Keep events fetched from the server (a case restored onto this tablet) as synced. */
export function importSynced(userId: number, list: LogEvent[]): Promise<void> {
  return events()('readwrite', (store) => {
    for (const event of list) {
      const req = store.get([userId, event.id]) as IDBRequest<StoredEvent | undefined>;
      req.onsuccess = () => {
        if (req.result) return; // never overwrite what this tablet recorded
        const row: StoredEvent = { kind: 'event', userId, event, seq: Date.parse(event.at) * 1000, state: 'synced' };
        store.put(row, [userId, event.id]);
      };
    }
    return promisifyRequest(store.transaction);
  });
}

/** Forget one rejected event the student has read (it was never stored anywhere else). */
export function dismissRejected(userId: number, eventId: string): Promise<void> {
  return del([userId, eventId], events());
}

/** The server's latest verdict per canal. */
export interface ServerCanal {
  result: CanalResult;
  receivedAt: string;
}

export function putServerCanals(userId: number, canals: CanalResult[]): Promise<void> {
  const receivedAt = new Date().toISOString();
  return server()('readwrite', (store) => {
    for (const c of canals) store.put({ result: c, receivedAt } satisfies ServerCanal, [userId, c.canalId]);
    return promisifyRequest(store.transaction);
  });
}

export function listServerCanals(userId: number): Promise<ServerCanal[]> {
  return server()('readonly', (store) =>
    promisifyRequest(store.getAll(userRange(userId)) as IDBRequest<ServerCanal[]>),
  );
}

/** Small per-user or per-device values (device id, last user, flow marks). */
export function getMeta<T>(key: IDBValidKey): Promise<T | undefined> {
  return get<T>(key, meta());
}
export function setMeta(key: IDBValidKey, value: unknown): Promise<void> {
  return set(key, value, meta());
}
export function delMeta(key: IDBValidKey): Promise<void> {
  return del(key, meta());
}

/**
 * Remove everything this tablet holds for one user — only when nothing is left to send or to
 * read. Returns false (and removes nothing) while the user still has queued events, or
 * refused ones whose reason they have not yet seen and dismissed.
 */
export async function clearUserIfSynced(userId: number): Promise<boolean> {
  const unsettled = (await listRows(userId)).some((r) => r.state === 'queued' || r.state === 'rejected');
  if (unsettled) return false;
  const range = userRange(userId);
  await events()('readwrite', (store) => {
    store.delete(range);
    return promisifyRequest(store.transaction);
  });
  await server()('readwrite', (store) => {
    store.delete(range);
    return promisifyRequest(store.transaction);
  });
  await meta()('readwrite', (store) => {
    store.delete(range);
    return promisifyRequest(store.transaction);
  });
  return true;
}
