/**
 * The background re-judging: when the rules version or the settings version changes, the
 * unlocked canals are judged again by the projection, about 200 to a transaction, in canal id
 * order. The cursor is kept in the database (recompute_jobs), so a restart goes on where it
 * stopped. Between transactions it yields, so a sync batch waiting for the database takes it
 * first. Canals of a locked case (an approved one) keep the verdict they were signed off with.
 */
import type { Knex } from 'knex';
import { CASE_STATES, isLocked } from '../rules/index';
import { REMOVED } from './canal-store';
import { currentJudge, projectCanals } from './projection';
import type { RecomputeJobRow } from './tables';

const JOB = 'rejudge';
export const RECOMPUTE_CHUNK = 200;
const LOCKED = CASE_STATES.filter(isLocked);

/** The canals the re-judging looks after: those of cases not locked, and not removed. */
function unlockedCanals(k: Knex): Knex.QueryBuilder {
  return k('canals')
    .join('cases', 'cases.id', 'canals.case_id')
    .whereNotIn('cases.review_status', LOCKED)
    .whereNot('canals.status', REMOVED);
}

/** Narrows `q` to canals not judged by the rules and settings versions of `judge`. */
function staleCanals(q: Knex.QueryBuilder, judge: { rulesVersion: number; settingsVersion: number }) {
  return q.where((w) =>
    w
      .whereNull('canals.rules_version')
      .orWhereNull('canals.settings_version')
      .orWhereNot('canals.rules_version', judge.rulesVersion)
      .orWhereNot('canals.settings_version', judge.settingsVersion),
  );
}

/**
 * One step: judges again up to `chunkSize` unlocked canals not yet judged by the current rules
 * and settings versions, after the cursor, in one transaction, and moves the cursor. Answers
 * the canal ids it judged, or null when there is nothing left.
 */
export async function recomputeStep(k: Knex, chunkSize = RECOMPUTE_CHUNK): Promise<string[] | null> {
  return k.transaction(async (trx) => {
    const judge = await currentJudge(trx);
    const now = judge.at;
    let job = (await trx('recompute_jobs').where({ name: JOB }).first()) as RecomputeJobRow | undefined;
    if (!job || job.rules_version !== judge.rulesVersion || job.settings_version !== judge.settingsVersion) {
      // A new target: start again from the first canal.
      job = {
        name: JOB,
        rules_version: judge.rulesVersion,
        settings_version: judge.settingsVersion,
        cursor: null,
        finished_at: null,
        started_at: now,
        updated_at: now,
      };
      await trx('recompute_jobs').insert(job).onConflict('name').merge();
    }
    if (job.finished_at !== null) return null;
    const q = staleCanals(unlockedCanals(trx), judge)
      .select('canals.id', 'canals.case_id')
      .orderBy('canals.id')
      .limit(chunkSize);
    if (job.cursor !== null) q.where('canals.id', '>', job.cursor);
    const rows = (await q) as { id: string; case_id: string }[];
    if (rows.length === 0) {
      await trx('recompute_jobs').where({ name: JOB }).update({ finished_at: now, updated_at: now });
      return null;
    }
    const byCase = new Map<string, string[]>();
    for (const r of rows) byCase.set(r.case_id, [...(byCase.get(r.case_id) ?? []), r.id]);
    for (const [caseId, ids] of byCase) await projectCanals(trx, caseId, ids, judge);
    await trx('recompute_jobs')
      .where({ name: JOB })
      .update({ cursor: rows.at(-1)!.id, updated_at: now });
    return rows.map((r) => r.id);
  });
}

export interface RecomputeOptions {
  chunkSize?: number;
  /** Called after each transaction with the canal ids it judged (tests watch the order). */
  onChunk?: (canalIds: string[]) => void | Promise<void>;
}

interface Run {
  again: boolean;
  stopping: boolean;
  done: Promise<void>;
}

const runs = new Map<Knex, Run>();

/** Lets whatever waits for the database (a sync batch) take it before the next transaction. */
const yieldToOthers = () => new Promise<void>((resolve) => setImmediate(resolve));

/**
 * Starts the re-judging in the background, or asks a running one to look again once it is
 * done (a settings change mid-run). The promise settles when it stops; it never rejects: a
 * failure is logged and the cursor lets the next start go on.
 */
export function startRecompute(k: Knex, opts: RecomputeOptions = {}): Promise<void> {
  const running = runs.get(k);
  if (running) {
    running.again = true;
    return running.done;
  }
  const run: Run = { again: false, stopping: false, done: Promise.resolve() };
  run.done = (async () => {
    let judged = 0;
    try {
      do {
        run.again = false;
        for (;;) {
          if (run.stopping) return;
          const ids = await recomputeStep(k, opts.chunkSize);
          if (ids === null) break;
          judged += ids.length;
          await opts.onChunk?.(ids);
          await yieldToOthers();
        }
      } while (run.again && !run.stopping);
      if (judged > 0) console.log(`[recompute] judged ${judged} canals again with the current rules and settings`);
    } catch (err) {
      console.error(
        `[recompute] stopped after ${judged} canals: ${(err as Error).message}; the next start goes on from its cursor`,
      );
    } finally {
      runs.delete(k);
    }
  })();
  runs.set(k, run);
  return run.done;
}

/** Stops a running re-judging after its current transaction (before the database closes). */
export async function stopRecompute(k: Knex): Promise<void> {
  const run = runs.get(k);
  if (!run) return;
  run.stopping = true;
  await run.done;
}

/** Whether a re-judging runs in this server now. */
export function isRecomputing(k: Knex): boolean {
  return runs.has(k);
}

/**
 * Asks for every unlocked canal to be judged again, even those the current rules and settings
 * already judged (a director's "recompute all canals"): in one transaction their settings
 * version is cleared and the job starts again from the first canal; then the re-judging is
 * started. `before` runs inside that transaction with the number of canals (the audit line). Answers how many canals it
 * will judge.
 */
export async function recomputeAll(
  k: Knex,
  before?: (trx: Knex.Transaction, canals: number) => Promise<void>,
): Promise<number> {
  const count = await k.transaction(async (trx) => {
    const judge = await currentJudge(trx);
    const ids = (await unlockedCanals(trx).pluck('canals.id')) as string[];
    for (let i = 0; i < ids.length; i += 400)
      await trx('canals')
        .whereIn('id', ids.slice(i, i + 400))
        .update({ settings_version: null });
    await trx('recompute_jobs')
      .insert({
        name: JOB,
        rules_version: judge.rulesVersion,
        settings_version: judge.settingsVersion,
        cursor: null,
        finished_at: null,
        started_at: judge.at,
        updated_at: judge.at,
      })
      .onConflict('name')
      .merge();
    await before?.(trx, ids.length);
    return ids.length;
  });
  void startRecompute(k);
  return count;
}

export interface RecomputeProgress {
  running: boolean;
  /** Unlocked canals judged by the rules and settings in force, of all unlocked canals. */
  done: number;
  total: number;
  startedAt: string | null;
  finishedAt: string | null;
  settingsVersion: number;
  rulesVersion: number;
}

/**
 * How far the re-judging has come, counted from the canals themselves (so it holds after a
 * restart): `done` of `total` unlocked canals carry the current rules and settings versions.
 * `startedAt` and `finishedAt` are those of the job towards these versions (null before it).
 */
export async function recomputeProgress(k: Knex): Promise<RecomputeProgress> {
  const judge = await currentJudge(k);
  const total = Number(((await unlockedCanals(k).count({ n: '*' }).first()) as { n: number | string }).n);
  const stale = Number(
    ((await staleCanals(unlockedCanals(k), judge).count({ n: '*' }).first()) as { n: number | string }).n,
  );
  const job = (await k('recompute_jobs').where({ name: JOB }).first()) as RecomputeJobRow | undefined;
  const current = job && job.rules_version === judge.rulesVersion && job.settings_version === judge.settingsVersion;
  return {
    running: isRecomputing(k),
    done: total - stale,
    total,
    startedAt: current ? (job.started_at ?? null) : null,
    finishedAt: current ? job.finished_at : null,
    settingsVersion: judge.settingsVersion,
    rulesVersion: judge.rulesVersion,
  };
}
