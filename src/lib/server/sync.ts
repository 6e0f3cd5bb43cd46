/**
 * The sync service: stores a batch of events exactly once, in one transaction, and answers
 * every event's fate and the recomputed state of every canal the batch touched
 * (sync-contract.md).
 */
import type { Knex } from 'knex';
import { canonicalEvent, parseEvent, type CanalResult, type LogEvent } from '../rules/index';
import { recomputeCanals, withReviewStatus } from './canal-store';
import { tolerances } from './settings';

export type ItemResult =
  | { id: string | null; status: 'stored' | 'duplicate' }
  | { id: string | null; status: 'rejected'; error: string; retry?: true };

export interface SyncAnswer {
  results: ItemResult[];
  canals: CanalResult[];
}

interface KnownCase {
  id: string;
  student_id: number;
  review_status: string;
}

/**
 * Order of processing inside a batch: cases, then canals, then steps, then the events that
 * name another event (voids, withdrawn cones), so their targets in the batch are decided first.
 */
function rank(e: LogEvent): number {
  if (e.type === 'case.opened') return 0;
  if (e.type === 'canal.added') return 1;
  return typeof (e.data as { eventId?: unknown }).eventId === 'string' ? 3 : 2;
}

const CHUNK = 400;

async function selectIn<T>(k: Knex, table: string, columns: string[], key: string, values: string[]): Promise<T[]> {
  const out: T[] = [];
  for (let i = 0; i < values.length; i += CHUNK) {
    out.push(...((await k(table).select(columns).whereIn(key, values.slice(i, i + CHUNK))) as T[]));
  }
  return out;
}

function idOf(raw: unknown): string | null {
  const id = (raw as { id?: unknown } | null)?.id;
  return typeof id === 'string' ? id : null;
}

/** Stores what it can of one batch for `userId` (a student) sent from `deviceId`. */
export async function ingestBatch(
  k: Knex,
  userId: number,
  deviceId: string,
  rawEvents: readonly unknown[],
  now: Date = new Date(),
): Promise<SyncAnswer> {
  const results: (ItemResult | undefined)[] = new Array(rawEvents.length);
  const parsed: { index: number; event: LogEvent; canonical: string }[] = [];

  const parseRefused = new Set<string>();
  rawEvents.forEach((raw, index) => {
    const p = parseEvent(raw, now);
    if (p.ok) {
      parsed.push({ index, event: p.event, canonical: canonicalEvent(p.event) });
      return;
    }
    const id = idOf(raw);
    results[index] = { id, status: 'rejected', error: p.error };
    if (id) parseRefused.add(id);
  });

  const tol = await tolerances(k);
  return k.transaction(async (trx) => {
    const ids = [...new Set(parsed.map((p) => p.event.id))];
    const existing = new Map(
      (await selectIn<{ id: string; canonical: string; user_id: number }>(trx, 'events', ['id', 'canonical', 'user_id'], 'id', ids)).map((r) => [r.id, r]),
    );
    const caseIds = [...new Set(parsed.map((p) => p.event.caseId))];
    const cases = new Map(
      (await selectIn<KnownCase>(trx, 'cases', ['id', 'student_id', 'review_status'], 'id', caseIds)).map((c) => [c.id, c]),
    );
    const canalIds = [...new Set(parsed.flatMap((p) => (p.event.canalId ? [p.event.canalId] : [])))];
    const canals = new Map(
      (await selectIn<{ id: string; case_id: string }>(trx, 'canals', ['id', 'case_id'], 'id', canalIds)).map((c) => [c.id, c.case_id]),
    );
    // Event ids of each case known to the server (stored, or stored earlier in this batch).
    const referenced = [
      ...new Set(
        parsed.flatMap((p) => {
          const d = p.event.data as { eventId?: unknown };
          return typeof d.eventId === 'string' ? [d.eventId] : [];
        }),
      ),
    ];
    const targets = new Map(
      (await selectIn<{ id: string; case_id: string; canal_id: string | null; type: string }>(
        trx, 'events', ['id', 'case_id', 'canal_id', 'type'], 'id', referenced,
      )).map((r) => [r.id, r]),
    );

    const seen = new Map<string, string>(); // id → canonical, for this batch
    const toInsert: Record<string, unknown>[] = [];
    const touched = new Map<string, Set<string> | 'all'>();
    const submittedCases = new Set<string>();
    const receivedAt = now.toISOString();
    const ordered = [...parsed].sort((a, b) => rank(a.event) - rank(b.event) || a.index - b.index);

    const reject = (index: number, id: string, error: string, retry = false) => {
      results[index] = retry ? { id, status: 'rejected', error, retry: true } : { id, status: 'rejected', error };
      refused.add(id);
    };

    const refused = new Set<string>(); // ids of this batch that were not kept
    for (const { index, event: e, canonical } of ordered) {
      const stored = existing.get(e.id);
      if (stored && stored.user_id !== userId) {
        // Someone else's event: say nothing about it, not even that it exists.
        reject(index, e.id, 'this case is not yours to write');
        continue;
      }
      const prior = stored?.canonical ?? seen.get(e.id);
      if (prior !== undefined) {
        results[index] =
          prior === canonical
            ? { id: e.id, status: 'duplicate' }
            : { id: e.id, status: 'rejected', error: `id ${e.id} was already used for a different event; record it again with a new id` };
        continue;
      }

      const known = cases.get(e.caseId);
      if (e.type === 'case.opened') {
        if (known) {
          reject(index, e.id, known.student_id === userId ? 'this case was already opened' : 'this case id is taken; open the case again');
          continue;
        }
        const d = e.data as { setting: string; tooth?: number; chartRef?: string };
        await trx('cases').insert({
          id: e.caseId, student_id: userId, setting: d.setting, tooth: d.tooth ?? null,
          chart_ref: d.chartRef ?? null, opened_at: e.at, review_status: 'open',
        });
        cases.set(e.caseId, { id: e.caseId, student_id: userId, review_status: 'open' });
      } else {
        if (!known) {
          reject(index, e.id, 'the case of this event is not on the server yet; it will be sent again', true);
          continue;
        }
        if (known.student_id !== userId) {
          reject(index, e.id, 'this case is not yours to write');
          continue;
        }
        if (known.review_status === 'approved') {
          reject(index, e.id, 'this case is signed off; ask your attending to reopen it before recording more');
          continue;
        }
        if (e.type === 'canal.added') {
          if (canals.has(e.canalId!)) {
            reject(index, e.id, 'this canal was already added');
            continue;
          }
          const d = e.data as { name: string };
          await trx('canals').insert({ id: e.canalId, case_id: e.caseId, name: d.name, status: 'set-up', state_json: '{}' });
          canals.set(e.canalId!, e.caseId);
        } else if (e.canalId) {
          const canalCase = canals.get(e.canalId);
          if (canalCase === undefined) {
            reject(index, e.id, 'the canal of this event is not on the server yet; it will be sent again', true);
            continue;
          }
          if (canalCase !== e.caseId) {
            reject(index, e.id, 'this canal belongs to another case');
            continue;
          }
        }
        const ref = (e.data as { eventId?: unknown }).eventId;
        if (typeof ref === 'string') {
          const target = targets.get(ref);
          if (!target && (refused.has(ref) || parseRefused.has(ref))) {
            reject(index, e.id, 'the event it names was refused, so there is nothing to withdraw');
            continue;
          }
          if (!target) {
            reject(index, e.id, 'the event it withdraws is not on the server yet; it will be sent again', true);
            continue;
          }
          if (target.case_id !== e.caseId) {
            reject(index, e.id, 'eventId must name an event of the same case');
            continue;
          }
          if (e.type === 'event.voided' && target.canal_id !== (e.canalId ?? null)) {
            reject(index, e.id, 'a withdrawal must name an event of its own canal, or a case-level event when it is case-level');
            continue;
          }
          if (e.type === 'accessory.removed' && (target.type !== 'accessory.placed' || target.canal_id !== e.canalId)) {
            reject(index, e.id, 'eventId must name an accessory cone placed in this canal');
            continue;
          }
        }
      }

      seen.set(e.id, canonical);
      targets.set(e.id, { id: e.id, case_id: e.caseId, canal_id: e.canalId ?? null, type: e.type });
      toInsert.push({
        id: e.id, case_id: e.caseId, canal_id: e.canalId ?? null, type: e.type, at: e.at,
        data_json: JSON.stringify(e.data), canonical, user_id: userId, device_id: deviceId, received_at: receivedAt,
      });
      results[index] = { id: e.id, status: 'stored' };
      if (e.type === 'case.submitted') submittedCases.add(e.caseId);
      const t = touched.get(e.caseId);
      if (!e.canalId) touched.set(e.caseId, 'all');
      else if (t !== 'all') touched.set(e.caseId, (t ?? new Set()).add(e.canalId));
    }

    // 250 rows × 10 columns stays well under SQLite's 32,766 bound parameters.
    for (let i = 0; i < toInsert.length; i += 250) await trx('events').insert(toInsert.slice(i, i + 250));
    for (const caseId of submittedCases) {
      await trx('cases').where({ id: caseId }).whereIn('review_status', ['open', 'returned'])
        .update({ review_status: 'submitted', submitted_at: receivedAt, updated_at: trx.fn.now() });
    }

    const out: CanalResult[] = [];
    for (const [caseId, which] of touched) {
      const ids = which === 'all'
        ? ((await trx('canals').select('id').where({ case_id: caseId }).orderBy('id')) as { id: string }[]).map((r) => r.id)
        : [...which];
      const results = await recomputeCanals(trx, caseId, ids, tol);
      let review = (await trx('cases').select('review_status').where({ id: caseId }).first()) as { review_status: string };
      // A withdrawn submission takes the case out of the review queue again.
      if (which === 'all' && review.review_status === 'submitted' && results.length > 0 && !results.some((r) => r.state.status === 'submitted')) {
        await trx('cases').where({ id: caseId }).update({ review_status: 'open', submitted_at: null });
        review = { review_status: 'open' };
      }
      await trx('cases').where({ id: caseId }).update({ updated_at: trx.fn.now() });
      out.push(...results.map((r) => withReviewStatus(r, review.review_status)));
    }
    return { results: results.map((r, i) => r ?? { id: idOf(rawEvents[i]), status: 'rejected', error: 'not processed' }), canals: out };
  });
}
