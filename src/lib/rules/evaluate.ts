// evaluateCanal: one canal's events in, its derived state and findings out.
import { compactionChecks } from './checks-compaction';
import { coneFitChecks, type CanalReview } from './conefit';
import { finishChecks } from './checks-finish';
import { setupChecks } from './checks-setup';
import type { LogEvent } from './events';
import type { Finding, Severity } from './severities';
import { deriveState, type CanalState } from './state';
import { canalTimeline } from './timeline';
import { resolveTolerances, type Tolerances } from './tolerances';
import { buildView } from './view';

export interface CanalResult {
  canalId: string;
  caseId: string;
  state: CanalState;
  findings: Finding[];
}

const SEVERITY_RANK: Record<Severity, number> = { stop: 0, caution: 1, note: 2 };

/** A canal's result together with the events that counted for it (its own and case-level). */
export interface CanalReading {
  result: CanalResult;
  /** The canal's timeline: voided events and the voids themselves removed, in rules order. */
  counted: LogEvent[];
}

/**
 * The state and open findings of one canal. `events` may hold the whole case, in any order:
 * the canal's own events and the case-level ones are used, voided events dropped, the rest
 * taken by `at` (as an instant) then id. Null when the case's `case.opened` or this canal's
 * `canal.added` is missing. Findings are listed stops first, then cautions, then notes, each
 * group in the order of the events that raised them. Never throws.
 *
 * `review` holds what only the server knows, the canal's `cone-fit` sign-offs, for
 * `cone-fit-not-approved` (judged only while `requireConeFitApproval` is 1; without `review`
 * the canal has none). readCanal, which the tablet uses with the default tolerances, leaves
 * that check out: its code stays out of the tablet's first paint.
 */
export function evaluateCanal(
  canalId: string,
  events: readonly LogEvent[],
  tolerances?: Partial<Tolerances>,
  review?: CanalReview,
): CanalResult | null {
  const reading = readCanal(canalId, events, tolerances);
  if (reading === null) return null;
  const extra = coneFitChecks(reading.counted, resolveTolerances(tolerances), review?.coneFit ?? [], review?.received);
  if (extra.length === 0) return reading.result;
  const { result } = reading;
  return { ...result, findings: ordered([...result.findings, ...extra], reading.counted) };
}

/** Stops first, then cautions, then notes; each group in the order of the events that raised them, else as given. */
function ordered(findings: readonly Finding[], events: readonly LogEvent[]): Finding[] {
  const position = new Map(events.map((e, i) => [e.id, i]));
  return findings
    .map((f, n) => ({ f, n }))
    .sort(
      (a, b) =>
        SEVERITY_RANK[a.f.severity] - SEVERITY_RANK[b.f.severity] ||
        (position.get(a.f.eventId ?? '') ?? -1) - (position.get(b.f.eventId ?? '') ?? -1) ||
        a.n - b.n,
    )
    .map((x) => x.f);
}

/**
 * What the events alone decide (evaluateCanal with no `review` and `requireConeFitApproval`
 * at 0) and the events it counted, from one pass: the tablet shows both (the step cards and
 * the timeline read the counted events, the findings and diagram the result).
 */
export function readCanal(
  canalId: string,
  events: readonly LogEvent[],
  tolerances?: Partial<Tolerances>,
): CanalReading | null {
  try {
    const timeline = canalTimeline(canalId, events);
    if (timeline === null) return null;
    const view = buildView(canalId, timeline, resolveTolerances(tolerances));
    if (view === null) return null;
    const findings = ordered([...setupChecks(view), ...compactionChecks(view), ...finishChecks(view)], view.events);
    return {
      result: { canalId, caseId: timeline.caseId, state: deriveState(view), findings },
      counted: timeline.events,
    };
  } catch {
    // Only input that never passed parseEvent can get here; it has no state to report.
    return null;
  }
}
