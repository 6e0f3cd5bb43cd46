/**
 * The sync service: stores a batch of events exactly once, in one transaction, and answers
 * every event's fate and the recomputed state of every canal the batch touched
 * (docs/sync-contract.md). What may be stored is decided in sync-admit.ts.
 */
import type { Knex } from 'knex';
import { canonicalEvent, caseTimeline, parseEvent, type CanalResult, type LogEvent } from '../rules/index';
import { addCanal, currentJudge, openCase, projectCase } from './projection';
import {
  keep,
  lifecycleAction,
  limitBreach,
  priorFate,
  refusal,
  type Known,
  type KnownCase,
  type KnownEvent,
  type LatestSubmission,
} from './sync-admit';
import { isRefusal, next } from '../rules/index';
import { loadTallies } from './sync-limits';
import { kickMail } from './mail-worker';
import { noticeConeFitRequested } from './mail-notices';
import { REMOVED, rowToEvent, UNFILLED_SQL, type EventRow } from './canal-store';
import type { CaseRow } from './tables';

import { CONTRACT_VERSION, type SyncAnswer, type SyncResult } from '../contract';

export type ItemResult = SyncResult;

interface Parsed {
  index: number;
  event: LogEvent;
  canonical: string;
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

/** Rows of `query()` whose `key` is among `values`, in chunks under SQLite's limit on bound values. */
async function selectIn<T>(query: () => Knex.QueryBuilder, key: string, values: string[]): Promise<T[]> {
  const out: T[] = [];
  for (let i = 0; i < values.length; i += CHUNK) {
    out.push(...((await query().whereIn(key, values.slice(i, i + CHUNK))) as T[]));
  }
  return out;
}

const unique = (xs: (string | undefined)[]) => [...new Set(xs.filter((x): x is string => typeof x === 'string'))];

function idOf(raw: unknown): string | null {
  const id = (raw as { id?: unknown } | null)?.id;
  return typeof id === 'string' ? id : null;
}

/** What the database already holds of the ids, cases, canals and targets the batch names. */
async function loadKnown(trx: Knex, userId: number, parsed: Parsed[], refused: Set<string>): Promise<Known> {
  const events = parsed.map((p) => p.event);
  const refs = unique(events.map((e) => (e.data as { eventId?: unknown }).eventId as string | undefined));
  const stored = await selectIn<{ id: string; canonical: string; user_id: number }>(
    () => trx('events').select('id', 'canonical', 'user_id'),
    'id',
    unique(events.map((e) => e.id)),
  );
  const caseRows = await selectIn<
    Omit<KnownCase, 'review_status'> & Pick<CaseRow, 'review_status' | 'discarded_at' | 'submitted_at'>
  >(
    () => trx('cases').select('id', 'student_id', 'review_status', 'discarded_at', 'submitted_at'),
    'id',
    unique(events.map((e) => e.caseId)),
  );
  const cases: KnownCase[] = caseRows.map((c) => ({
    id: c.id,
    student_id: c.student_id,
    review_status: c.discarded_at === null ? c.review_status : 'discarded',
  }));
  // Only asked when the batch discards a case: which of them have a filled canal.
  const discarding = unique(events.filter((e) => e.type === 'case.discarded').map((e) => e.caseId));
  const filled = discarding.length === 0 ? [] : await filledCases(trx, discarding);
  const canals = await selectIn<{ id: string; case_id: string; student_id: number }>(
    () =>
      trx('canals')
        .join('cases', 'cases.id', 'canals.case_id')
        .select('canals.id', 'canals.case_id', 'cases.student_id'),
    'canals.id',
    unique(events.map((e) => e.canalId)),
  );
  const targets = await selectIn<KnownEvent>(
    () => trx('events').select('id', 'case_id', 'canal_id', 'type', 'user_id'),
    'id',
    refs,
  );
  // Only this student's cases can take their events; a new case starts with an empty tally.
  const tallies = await loadTallies(
    trx,
    cases.filter((c) => c.student_id === userId).map((c) => c.id),
  );
  const submissions = await latestSubmissions(trx, caseRows);
  // Only asked when the batch records an approval at the chair.
  const attendings = events.some((e) => e.type === 'conefit.approvedAtChair')
    ? ((await trx('assignments').select('attending_id').where({ student_id: userId })) as { attending_id: number }[])
    : [];
  return {
    userId,
    submissions,
    attendings: new Set(attendings.map((a) => String(a.attending_id))),
    stored: new Map(stored.map((r) => [r.id, r])),
    kept: new Map(),
    cases: new Map(cases.map((c) => [c.id, c])),
    canals: new Map(canals.map((c) => [c.id, { caseId: c.case_id, studentId: c.student_id }])),
    targets: new Map(targets.map((t) => [t.id, t])),
    refused,
    tallies,
    filled: new Set(filled),
  };
}

/**
 * The latest standing `case.submitted` of each case (voids applied, as the rules apply them)
 * and whether an attending acted on it since it was received: a sign-off, or a comment by
 * anyone but the case's student. Only cases waiting for review are asked.
 */
async function latestSubmissions(
  trx: Knex,
  cases: readonly Pick<CaseRow, 'id' | 'student_id' | 'review_status' | 'submitted_at' | 'discarded_at'>[],
): Promise<Map<string, LatestSubmission>> {
  const out = new Map<string, LatestSubmission>();
  for (const c of cases) {
    if (c.review_status !== 'submitted' || c.discarded_at !== null) continue;
    const rows: EventRow[] = await trx('events')
      .select('id', 'case_id', 'canal_id', 'type', 'at', 'data_json')
      .where({ case_id: c.id })
      .whereNull('canal_id')
      .whereIn('type', ['case.submitted', 'event.voided']);
    const latest = caseTimeline(c.id, rows.map(rowToEvent))
      .filter((e) => e.type === 'case.submitted')
      .at(-1);
    if (!latest) continue;
    const since = c.submitted_at ?? '';
    const signoff = await trx('signoffs').where({ case_id: c.id }).where('created_at', '>=', since).first('id');
    const comment = signoff
      ? undefined
      : await trx('comments')
          .where({ case_id: c.id })
          .whereNot('author_id', c.student_id)
          .where('created_at', '>=', since)
          .first('id');
    out.set(c.id, { eventId: latest.id, acted: Boolean(signoff ?? comment) });
  }
  return out;
}

/**
 * Which of the cases have a live canal with a seated master cone. A canal judged before the
 * state recorded `unfilled` (rules version 1) counts as filled when its master cone is seated.
 */
async function filledCases(trx: Knex, caseIds: string[]): Promise<string[]> {
  const rows: { case_id: string }[] = await trx('canals')
    .distinct('case_id')
    .whereIn('case_id', caseIds)
    .whereNot('status', REMOVED)
    .whereRaw(`${UNFILLED_SQL} = 0`);
  return rows.map((r) => r.case_id);
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
  const parsed: Parsed[] = [];
  const refused = new Set<string>();
  rawEvents.forEach((raw, index) => {
    const p = parseEvent(raw, now);
    if (p.ok) {
      parsed.push({ index, event: p.event, canonical: canonicalEvent(p.event) });
      return;
    }
    const id = idOf(raw);
    results[index] = { id, status: 'rejected', error: p.error };
    if (id) refused.add(id);
  });

  // The settings are read once per batch, not per canal.
  const judge = await currentJudge(k, now.toISOString());
  const answer = await k.transaction(async (trx): Promise<SyncAnswer> => {
    const known = await loadKnown(trx, userId, parsed, refused);
    const toInsert: Record<string, unknown>[] = [];
    const touched = new Map<string, Set<string> | 'all'>();
    const submittedCases = new Set<string>();
    const withdrawnCases = new Set<string>();
    /** Cone-fit requests stored by this batch, one per canal (the latest): their attendings are told. */
    const requests = new Map<string, LogEvent>();
    const waitsForReview = (e: LogEvent) =>
      known.cases.get(e.caseId)?.review_status === 'submitted' && lifecycleAction(e, known) === 'record';
    const receivedAt = judge.at;
    const deferred = new Set<Parsed>();

    /** Decides one event: answers it, or keeps it to be stored. `final`: no more deferring. */
    async function admit(p: Parsed, final: boolean): Promise<void> {
      const { index, event: e, canonical } = p;
      let fate = priorFate(e, canonical, known) ?? refusal(e, known);
      // A step refused because its case waits for review may follow a withdrawal of that
      // submission later in the batch (voids come last): it is tried again after them.
      if (fate && !final && !('status' in fate) && waitsForReview(e)) {
        deferred.add(p);
        return;
      }
      if (!fate) {
        const breach = limitBreach(e, known);
        if (breach?.limit === 'canalsPerCase' && !final) {
          deferred.add(p);
          return;
        }
        if (breach) fate = { error: breach.error };
      }
      if (fate) {
        results[index] = 'status' in fate ? { id: e.id, ...fate } : { id: e.id, status: 'rejected', ...fate };
        // Refused for good (not "send again"): a withdrawal naming it can never be stored.
        if (!('status' in fate) && !fate.retry) refused.add(e.id);
        return;
      }
      if (e.type === 'case.opened') {
        const d = e.data;
        const c = await openCase(trx, {
          id: e.caseId,
          student_id: userId,
          setting: d.setting,
          tooth: d.tooth ?? null,
          chart_ref: d.chartRef ?? null,
          opened_at: e.at,
        });
        known.cases.set(e.caseId, { ...c, student_id: userId });
      } else if (e.type === 'canal.added') {
        await addCanal(trx, { id: e.canalId!, case_id: e.caseId, name: e.data.name });
        known.canals.set(e.canalId!, { caseId: e.caseId, studentId: userId });
      }
      // A discard or its void moves the case at once for the rest of the batch; the projection
      // settles the stored state from the events that stand.
      const action = lifecycleAction(e, known);
      if (action !== 'record') {
        const c = known.cases.get(e.caseId)!;
        const moved = next(c.review_status, action);
        if (!isRefusal(moved)) known.cases.set(e.caseId, { ...c, review_status: moved });
      }
      if (action === 'submit') known.submissions.set(e.caseId, { eventId: e.id, acted: false });
      if (action === 'withdraw') {
        known.submissions.delete(e.caseId);
        withdrawnCases.add(e.caseId);
      }
      if (e.type === 'master.seated') known.filled.add(e.caseId);
      keep(e, known);
      known.kept.set(e.id, canonical);
      toInsert.push({
        id: e.id,
        case_id: e.caseId,
        canal_id: e.canalId ?? null,
        type: e.type,
        at: e.at,
        data_json: JSON.stringify(e.data),
        canonical,
        user_id: userId,
        device_id: deviceId,
        received_at: receivedAt,
      });
      results[index] = { id: e.id, status: 'stored' };
      if (e.type === 'case.submitted') submittedCases.add(e.caseId);
      if (e.type === 'conefit.requested') requests.set(e.canalId!, e);
      const t = touched.get(e.caseId);
      if (!e.canalId) touched.set(e.caseId, 'all');
      else if (t !== 'all') touched.set(e.caseId, (t ?? new Set()).add(e.canalId));
    }

    const order = [...parsed].sort((a, b) => rank(a.event) - rank(b.event) || a.index - b.index);
    for (const p of order) await admit(p, false);
    if (deferred.size > 0) {
      // A canal set up past the limit may fit once the batch's withdrawals are in (voids come
      // last); it is tried again, then the events that were told to wait, such as its steps.
      const waiting = (r: ItemResult | undefined) => r?.status === 'rejected' && r.retry === true;
      for (const p of order.filter((x) => deferred.has(x) || waiting(results[x.index]))) await admit(p, true);
    }

    // 250 rows × 10 columns stays well under SQLite's limits on one insert.
    for (let i = 0; i < toInsert.length; i += 250) await trx('events').insert(toInsert.slice(i, i + 250));
    const canals: CanalResult[] = [];
    for (const [caseId, which] of touched) {
      const moves = { submitted: submittedCases.has(caseId), withdrawn: withdrawnCases.has(caseId) };
      canals.push(...(await projectCase(trx, caseId, which, moves, judge, userId)));
    }
    // The attendings hear of a cone-fit request in the transaction that stores it, unless the
    // batch withdrew it again (a tap undone before the tablet was back online).
    const voided = new Set(
      toInsert.filter((r) => r.type === 'event.voided').map((r) => JSON.parse(r.data_json as string).eventId as string),
    );
    for (const [canalId, e] of requests) {
      if (voided.has(e.id)) continue;
      const name = canals.find((c) => c.canalId === canalId)?.state.name ?? '';
      await noticeConeFitRequested(trx, e.caseId, name, receivedAt);
    }
    return {
      contractVersion: CONTRACT_VERSION,
      settingsVersion: judge.settingsVersion,
      results: results.map((r, i) => r ?? { id: idOf(rawEvents[i]), status: 'rejected', error: 'not processed' }),
      canals,
    };
  });
  // A submission or a cone-fit request wrote its notices in the transaction; they go now that it committed.
  kickMail();
  return answer;
}
