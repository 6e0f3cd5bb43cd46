/**
 * The projection: the one writer of everything derived from the events. It judges canals
 * with the rules core and stores their state, counts and open findings, the history of each
 * finding (raised, cleared), the rules and settings versions that judged them, and settles
 * the case's status through the lifecycle (rules/lifecycle.ts). Sync and the background
 * re-judging call it; nothing else writes those columns and tables.
 */
import type { Knex } from 'knex';
import type { CaseRow } from './tables';
import {
  caseTimeline,
  evaluateCanal,
  isRefusal,
  next,
  RULES_VERSION,
  type CanalResult,
  type CaseAction,
  type CaseState,
  type ConeFitSignoff,
  type Finding,
  type LogEvent,
  type Tolerances,
} from '../rules/index';
import { REMOVED, rowToEvent, withReviewStatus, type EventRow } from './canal-store';
import type { CanalDerivedRow, FindingHistoryRow, FindingRow } from './tables';
import { readSettings, tolerancesOf } from './settings';
import { audit } from './audit';
import { noticeSubmitted } from './mail-notices';

/** What judges canals in one run (a batch, a step of the re-judging): read once, not per canal. */
export interface Judge {
  tolerances: Tolerances;
  settingsVersion: number;
  rulesVersion: number;
  /** When this judging happens (ISO 8601), for the finding history. */
  at: string;
}

/** The judge of the settings in force now. */
export async function currentJudge(k: Knex, at: string = new Date().toISOString()): Promise<Judge> {
  const s = await readSettings(k);
  return { tolerances: tolerancesOf(s.values), settingsVersion: s.version, rulesVersion: RULES_VERSION, at };
}

const CHUNK = 400;

async function inChunks<T>(ids: readonly string[], query: (chunk: string[]) => Promise<T[]>): Promise<T[]> {
  const out: T[] = [];
  for (let i = 0; i < ids.length; i += CHUNK) out.push(...(await query(ids.slice(i, i + CHUNK))));
  return out;
}

/**
 * The case-level events of a case and the events of the given canals, by canal: all a canal's
 * rules see (its canal.added names its case; a void counts only in its own scope).
 */
async function eventsFor(
  k: Knex,
  caseId: string,
  canalIds: readonly string[],
): Promise<{ caseLevel: LogEvent[]; byCanal: Map<string, LogEvent[]> }> {
  const select = () =>
    k('events').select('id', 'case_id', 'canal_id', 'type', 'at', 'data_json').where({ case_id: caseId });
  const rows: EventRow[] = await select().whereNull('canal_id');
  rows.push(...(await inChunks(canalIds, (chunk) => select().whereIn('canal_id', chunk))));
  const caseLevel: LogEvent[] = [];
  const byCanal = new Map<string, LogEvent[]>(canalIds.map((id) => [id, []]));
  for (const r of rows) {
    if (r.canal_id === null) caseLevel.push(rowToEvent(r));
    else byCanal.get(r.canal_id)?.push(rowToEvent(r));
  }
  return { caseLevel, byCanal };
}

/**
 * What the rules need besides the events for `cone-fit-not-approved`, by canal: the canal's
 * `cone-fit` sign-offs, and when the server received its cone-fit records (docs/review.md).
 * Read only while `requireConeFitApproval` is on (the check judges nothing otherwise), so the
 * hot path of sync pays nothing for it.
 */
async function canalReviews(
  k: Knex,
  caseId: string,
  canalIds: readonly string[],
  judge: Judge,
): Promise<Map<string, { coneFit: ConeFitSignoff[]; received: Record<string, string> }>> {
  const out = new Map(
    canalIds.map((id) => [id, { coneFit: [] as ConeFitSignoff[], received: {} as Record<string, string> }]),
  );
  if (!(judge.tolerances.requireConeFitApproval >= 1)) return out;
  const signoffs = (await inChunks(canalIds, (chunk) =>
    k('signoffs')
      .select('canal_id', 'decision', 'created_at')
      .where({ case_id: caseId, checkpoint: 'cone-fit' })
      .whereIn('decision', ['approved', 'returned'])
      .whereIn('canal_id', chunk)
      .orderBy('id'),
  )) as { canal_id: string; decision: ConeFitSignoff['decision']; created_at: string }[];
  for (const r of signoffs) out.get(r.canal_id)?.coneFit.push({ decision: r.decision, at: r.created_at });
  const records = (await inChunks(canalIds, (chunk) =>
    k('events')
      .select('id', 'canal_id', 'received_at')
      .where({ case_id: caseId })
      .whereIn('type', ['conefit.requested', 'conefit.approvedAtChair'])
      .whereIn('canal_id', chunk),
  )) as { id: string; canal_id: string; received_at: string }[];
  for (const r of records) {
    const review = out.get(r.canal_id);
    if (review) review.received[r.id] = r.received_at;
  }
  return out;
}

type StoredFinding = Pick<FindingRow, 'canal_id' | 'code' | 'severity' | 'event_id' | 'message'>;
type OpenHistory = Pick<FindingHistoryRow, 'id' | 'canal_id' | 'code' | 'event_id'>;

const keyOf = (code: string, eventId: string | null | undefined) => `${code}\u0000${eventId ?? ''}`;

function groupBy<T>(rows: readonly T[], key: (r: T) => string): Map<string, T[]> {
  const out = new Map<string, T[]>();
  for (const r of rows) {
    const k = key(r);
    const list = out.get(k);
    if (list) list.push(r);
    else out.set(k, [r]);
  }
  return out;
}

const sameFindings = (stored: readonly StoredFinding[], now: readonly Finding[]) =>
  stored.length === now.length &&
  stored.every(
    (s, i) =>
      s.code === now[i]!.code &&
      s.severity === now[i]!.severity &&
      s.event_id === (now[i]!.eventId ?? null) &&
      s.message === now[i]!.message,
  );

/**
 * Changes to the finding history of one canal: the open rows before, the findings open
 * now. A finding is known by its code and the event that raised it; the same pair raised
 * twice counts twice.
 */
function diffHistory(
  canalId: string,
  open: readonly OpenHistory[],
  now: readonly Finding[],
  at: string,
  raise: Omit<FindingHistoryRow, 'id'>[],
  clear: number[],
): void {
  const before = groupBy(open, (h) => keyOf(h.code, h.event_id));
  const after = groupBy(now, (f) => keyOf(f.code, f.eventId));
  for (const [key, rows] of before) {
    const still = after.get(key)?.length ?? 0;
    // The newest rows are cleared first, so the one raised earliest keeps its date.
    for (const h of rows.slice(still).reverse()) clear.push(h.id);
  }
  for (const [key, findings] of after) {
    const had = before.get(key)?.length ?? 0;
    for (const f of findings.slice(had))
      raise.push({
        canal_id: canalId,
        code: f.code,
        event_id: f.eventId ?? null,
        first_raised_at: at,
        cleared_at: null,
      });
  }
}

/**
 * Judges the given canals of one case and stores what the rules make of them; answers their
 * results (without the case's review status). The rules see each canal's events and, for the
 * cone-fit check, its `cone-fit` sign-offs (a sign-off calls this too: reviews.ts). Each canal is evaluated with its own events and
 * the case-level ones only, so a batch that touched one canal reads and judges that canal.
 */
export async function projectCanals(
  k: Knex,
  caseId: string,
  canalIds: Iterable<string>,
  judge: Judge,
): Promise<CanalResult[]> {
  const ids = [...canalIds];
  if (ids.length === 0) return [];
  const { caseLevel, byCanal } = await eventsFor(k, caseId, ids);
  const reviews = await canalReviews(k, caseId, ids, judge);
  const stored = groupBy(
    (await inChunks(ids, (chunk) =>
      k('findings')
        .select('canal_id', 'code', 'severity', 'event_id', 'message')
        .whereIn('canal_id', chunk)
        .orderBy('id'),
    )) as StoredFinding[],
    (f) => f.canal_id,
  );
  const open = groupBy(
    (await inChunks(ids, (chunk) =>
      k('finding_history')
        .select('id', 'canal_id', 'code', 'event_id')
        .whereIn('canal_id', chunk)
        .whereNull('cleared_at'),
    )) as OpenHistory[],
    (h) => h.canal_id,
  );
  const versions = { rules_version: judge.rulesVersion, settings_version: judge.settingsVersion };
  const raise: Omit<FindingHistoryRow, 'id'>[] = [];
  const clear: number[] = [];
  const out: CanalResult[] = [];
  for (const canalId of ids) {
    const result = evaluateCanal(
      canalId,
      [...caseLevel, ...(byCanal.get(canalId) ?? [])],
      judge.tolerances,
      reviews.get(canalId),
    );
    const findings = result?.findings ?? [];
    diffHistory(canalId, open.get(canalId) ?? [], findings, judge.at, raise, clear);
    const before = stored.get(canalId) ?? [];
    if (!result) {
      // Its canal.added was voided: the canal no longer exists for the rules or the reader.
      if (before.length > 0) await k('findings').where({ canal_id: canalId }).delete();
      await k('canals')
        .where({ id: canalId })
        .update({ status: REMOVED, stops: 0, cautions: 0, notes: 0, ...versions, updated_at: k.fn.now() });
      continue;
    }
    const count = (s: string) => findings.filter((f) => f.severity === s).length;
    const derived: CanalDerivedRow = {
      status: result.state.status,
      name: result.state.name,
      state_json: JSON.stringify(result.state),
      stops: count('stop'),
      cautions: count('caution'),
      notes: count('note'),
      ...versions,
    };
    await k('canals')
      .where({ id: canalId })
      .update({ ...derived, updated_at: k.fn.now() });
    if (!sameFindings(before, findings)) {
      if (before.length > 0) await k('findings').where({ canal_id: canalId }).delete();
      const rows = findings.map((f) => ({
        canal_id: canalId,
        case_id: caseId,
        code: f.code,
        severity: f.severity,
        event_id: f.eventId ?? null,
        message: f.message,
      }));
      // SQLite takes at most 500 rows in one multi-row insert; a canal can have more findings.
      for (let i = 0; i < rows.length; i += 100) await k('findings').insert(rows.slice(i, i + 100));
    }
    out.push(result);
  }
  for (let i = 0; i < raise.length; i += 100) await k('finding_history').insert(raise.slice(i, i + 100));
  for (let i = 0; i < clear.length; i += CHUNK)
    await k('finding_history')
      .whereIn('id', clear.slice(i, i + CHUNK))
      .update({ cleared_at: judge.at });
  return out;
}

/** Stores a new case as `case.opened` describes it, in the lifecycle's first state. */
export async function openCase(
  k: Knex,
  row: {
    id: string;
    student_id: number;
    setting: CaseRow['setting'];
    tooth: number | null;
    chart_ref: string | null;
    opened_at: string;
  },
): Promise<ProjectedCase> {
  await k('cases').insert({ ...row, review_status: 'open' });
  return { id: row.id, review_status: 'open' };
}

/** Stores a new canal as `canal.added` names it, not yet judged (the batch's projection judges it). */
export async function addCanal(k: Knex, row: { id: string; case_id: string; name: string }): Promise<void> {
  await k('canals').insert({ ...row, status: 'set-up', state_json: '{}' });
}

/**
 * Moves a case by an attending's review (`approve`, `return`, `reopen`) through the lifecycle;
 * throws with the lifecycle's reason when the case may not move so.
 */
export async function reviewCase(
  k: Knex,
  caseId: string,
  action: 'approve' | 'return' | 'reopen',
  at: string,
): Promise<CaseState> {
  const row = (await k('cases').where({ id: caseId }).first('review_status')) as ProjectedCase | undefined;
  if (!row) throw new Error(`no case ${caseId}`);
  const moved = next(row.review_status, action);
  if (isRefusal(moved)) throw new Error(moved.refused);
  // The column takes the review states only; a discarded case arrives with its own issue.
  if (moved === 'discarded') throw new Error('a review does not discard a case');
  // Reopened, the case is back at work: no submission waits and no approval stands.
  const change = {
    review_status: moved,
    signed_off_at: moved === 'approved' ? at : null,
    ...(action === 'reopen' ? { submitted_at: null } : {}),
    updated_at: k.fn.now(),
  };
  await k('cases').where({ id: caseId }).update(change);
  return moved;
}

/**
 * Whether a `case.discarded` stands once voids are applied, and the case's `discarded_at` to
 * match, through the lifecycle's `discard` and `restore`; each change gets an audit line, which
 * keeps a patient case's chart number so the clinic can trace a case that left the lists.
 */
async function settleDiscard(
  trx: Knex,
  caseId: string,
  row: Pick<CaseRow, 'review_status' | 'discarded_at' | 'chart_ref'>,
  at: string,
  actorId: number | null,
): Promise<void> {
  const rows: EventRow[] = await trx('events')
    .select('id', 'case_id', 'canal_id', 'type', 'at', 'data_json')
    .where({ case_id: caseId })
    .whereNull('canal_id')
    .whereIn('type', ['case.discarded', 'event.voided']);
  const standing = caseTimeline(caseId, rows.map(rowToEvent)).find((e) => e.type === 'case.discarded');
  const state: CaseState = row.discarded_at === null ? row.review_status : 'discarded';
  const action: CaseAction | null =
    standing !== undefined && state !== 'discarded'
      ? 'discard'
      : standing === undefined && state === 'discarded'
        ? 'restore'
        : null;
  if (action === null || isRefusal(next(state, action))) return;
  await trx('cases')
    .where({ id: caseId })
    .update({ discarded_at: action === 'discard' ? at : null, updated_at: trx.fn.now() });
  await audit(trx, actorId, action === 'discard' ? 'case.discard' : 'case.restore', 'case', caseId, {
    ...(row.chart_ref === null ? {} : { chartRef: row.chart_ref }),
    ...(standing?.type === 'case.discarded' ? { reason: standing.data.reason } : {}),
  });
}

/** How a batch moved the case: a submission stored, a withdrawal of the latest one stored. */
export interface CaseMoves {
  submitted: boolean;
  withdrawn: boolean;
}

/** A case as the projection needs it. */
export interface ProjectedCase {
  id: string;
  review_status: CaseState;
}

/**
 * Judges the touched canals of one case (`'all'` after a case-level event), settles the
 * case's status through the lifecycle (a standing submission submits it; a withdrawn one
 * takes it out of the queue; a standing discard discards it, its void restores it) and
 * answers the canals as readers see them. `actorId` is the student whose batch it is.
 */
export async function projectCase(
  trx: Knex,
  caseId: string,
  which: ReadonlySet<string> | 'all',
  moves: CaseMoves,
  judge: Judge,
  actorId: number | null = null,
): Promise<CanalResult[]> {
  const { submitted, withdrawn } = moves;
  const row = (await trx('cases').where({ id: caseId }).first('review_status', 'discarded_at', 'chart_ref')) as
    Pick<CaseRow, 'review_status' | 'discarded_at' | 'chart_ref'> | undefined;
  if (!row) throw new Error(`no case ${caseId}`);
  const c: ProjectedCase = { id: caseId, review_status: row.review_status };
  if (which === 'all') await settleDiscard(trx, caseId, row, judge.at, actorId);
  const ids =
    which === 'all'
      ? ((await trx('canals').select('id').where({ case_id: c.id }).orderBy('id')) as { id: string }[]).map((r) => r.id)
      : [...which];
  const out = await projectCanals(trx, c.id, ids, judge);
  // Whether a submission stands once voids are applied (the rules' status says so; a case
  // with no canal yet has only the new event to go by).
  const live = out.length > 0 ? out.some((r) => r.state.status === 'submitted') : submitted;
  // A withdrawal admitted by sync names the latest submission, which an earlier one (returned
  // since) may outlive in the rules' view: it withdraws all the same.
  const action: CaseAction | null =
    submitted && live ? 'submit' : withdrawn || (which === 'all' && !live) ? 'withdraw' : null;
  const moved = action === null ? c.review_status : next(c.review_status, action);
  // A refused move leaves the case as it is: a second submission, a withdrawal of none.
  const review = isRefusal(moved) ? c.review_status : moved;
  const change: Record<string, unknown> = { updated_at: trx.fn.now() };
  if (review !== c.review_status) {
    change.review_status = review;
    if (review === 'submitted') change.submitted_at = judge.at;
    if (review === 'open') change.submitted_at = null;
  }
  await trx('cases').where({ id: c.id }).update(change);
  // The attendings hear of a submission in the transaction that makes it (mail-notices.ts).
  if (review === 'submitted' && c.review_status !== 'submitted') await noticeSubmitted(trx, caseId, judge.at);
  return out.map((r) => withReviewStatus(r, review));
}
