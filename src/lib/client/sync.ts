import { LIMITS, type CanalResult, type LogEvent } from '../rules/core';
import { fetchCaseIfChanged, postSync, type Answer, type CaseAnswer, type ReviewStatus, type SyncAnswer } from './api';
import {
  applyResults,
  importSynced,
  listQueued,
  putServerCanals,
  refuseOrphans,
  setMeta,
  type StoredEvent,
} from './outbox';

/** The server takes at most 500 events and 1 MB per batch (docs/sync-contract.md, limits.ts). */
export const MAX_BATCH_EVENTS: number = LIMITS.eventsPerBatch;
export const MAX_BATCH_BYTES = 900_000; // headroom under LIMITS.bytesPerBatch for the envelope

export type SyncOutcome =
  | { kind: 'done'; sent: number; stored: number; rejected: number; retry: number; canals: CanalResult[] }
  | { kind: 'offline' }
  | { kind: 'signed-out' }
  | { kind: 'other-user' }
  | { kind: 'error'; status: number; error?: string };

export interface SyncDeps {
  post: (deviceId: string, events: LogEvent[], userId: number) => Promise<Answer<SyncAnswer>>;
  /** The tablet's clock (the retry cap counts days by it). */
  now?: () => Date;
}
const realDeps: SyncDeps = { post: postSync };

/** Split the outbox, in recording order, into batches the server accepts. */
export function toBatches(rows: StoredEvent[], maxEvents = MAX_BATCH_EVENTS, maxBytes = MAX_BATCH_BYTES): LogEvent[][] {
  const batches: LogEvent[][] = [];
  let current: LogEvent[] = [];
  let bytes = 0;
  for (const { event } of rows) {
    const size = JSON.stringify(event).length + 1;
    if (current.length > 0 && (current.length >= maxEvents || bytes + size > maxBytes)) {
      batches.push(current);
      current = [];
      bytes = 0;
    }
    current.push(event);
    bytes += size;
  }
  if (current.length > 0) batches.push(current);
  return batches;
}

/**
 * Send this user's outbox once. Every batch names the outbox's owner (`userId`), and the
 * server stores nothing of a batch whose owner is not the signed-in user (403 `other-user`):
 * events recorded by one user never go out under another's session, with no separate
 * round trip to ask who is signed in.
 */
export async function syncOnce(userId: number, deviceId: string, deps: SyncDeps = realDeps): Promise<SyncOutcome> {
  await refuseOrphans(userId);
  const queued = await listQueued(userId);

  const total = { sent: 0, stored: 0, rejected: 0, retry: 0 };
  const canals = new Map<string, CanalResult>();
  let maxEvents = MAX_BATCH_EVENTS;
  const pending = toBatches(queued, maxEvents);
  while (pending.length > 0) {
    const batch = pending.shift()!;
    const answer = await deps.post(deviceId, batch, userId);
    if (answer.kind === 'offline') return { kind: 'offline' };
    if (answer.kind === 'status') {
      if (answer.status === 413 && batch.length > 1) {
        // Too big after all: halve and try again, nothing was stored.
        maxEvents = Math.max(1, Math.floor(batch.length / 2));
        pending.unshift(batch.slice(0, maxEvents), batch.slice(maxEvents));
        continue;
      }
      if (answer.status === 401) return { kind: 'signed-out' };
      // Someone else signed in mid-sync (another tab): the server refused, nothing was stored.
      if (answer.status === 403 && answer.code === 'other-user') return { kind: 'other-user' };
      return { kind: 'error', status: answer.status, error: answer.error };
    }
    const { results, canals: touched } = answer.value;
    await applyResults(userId, results, deps.now?.() ?? new Date());
    if (touched?.length) await putServerCanals(userId, touched);
    for (const c of touched ?? []) canals.set(c.canalId, c);
    total.sent += batch.length;
    for (const r of results) {
      if (r.status === 'stored' || r.status === 'duplicate') total.stored++;
      else if (r.status === 'rejected' && r.retry) total.retry++;
      else total.rejected++;
    }
  }
  return { kind: 'done', ...total, canals: [...canals.values()] };
}

export type PullOutcome =
  | { kind: 'unchanged' }
  | { kind: 'changed'; etag: string | null; reviewStatus?: ReviewStatus }
  | { kind: 'offline' }
  | { kind: 'signed-out' }
  | { kind: 'missing' }
  | { kind: 'error'; status: number };

/**
 * Pull one case's news with a conditional GET and merge what changed into this tablet: the
 * server's canal verdicts (state, findings, review states), any stored event the tablet
 * lacks (never overwriting one it recorded), and the case's sign-offs and comments, kept as
 * they came under `[userId, 'news', caseId]` (news.ts reads them). `etag` is the one the last
 * pull returned.
 */
export async function pullCase(
  userId: number,
  caseId: string,
  etag: string | null,
  get: (caseId: string, etag: string | null) => Promise<Answer<CaseAnswer>> = fetchCaseIfChanged,
): Promise<PullOutcome> {
  const news = await get(caseId, etag);
  if (news.kind === 'offline') return { kind: 'offline' };
  if (news.kind === 'status') {
    if (news.status === 304) return { kind: 'unchanged' };
    if (news.status === 401) return { kind: 'signed-out' };
    // Not on the server yet (its opening still queued), or not this user's: nothing to merge.
    return news.status === 404 ? { kind: 'missing' } : { kind: 'error', status: news.status };
  }
  const { events, canals, reviewStatus, signoffs, comments } = news.value;
  if (events.length) await importSynced(userId, events);
  if (canals.length) await putServerCanals(userId, canals);
  if (signoffs) await setMeta([userId, 'news', caseId], { signoffs, comments });
  return { kind: 'changed', etag: news.etag ?? null, ...(reviewStatus ? { reviewStatus } : {}) };
}

/** Back-off after failed attempts: 2 s, 4 s, 8 s … capped at 5 minutes, with jitter. */
export function backoffMs(failures: number, random = Math.random): number {
  if (failures <= 0) return 0;
  const base = Math.min(2000 * 2 ** (failures - 1), 300_000);
  return Math.round(base * (0.8 + 0.4 * random()));
}
