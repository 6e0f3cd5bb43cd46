// One canal's events read once into the facts every check needs.
import type { EventOf, EventType, LogEvent } from './events';
import { canalThirds, type CanalThirds } from './thirds';
import type { Timeline } from './timeline';
import type { Tolerances } from './tolerances';

/** An event with its position in the rules order. */
export interface At<T extends EventType> {
  e: EventOf<T>;
  i: number;
}

export interface CanalView {
  events: LogEvent[];
  caseId: string;
  canalId: string;
  caseOpened: EventOf<'case.opened'>;
  canalAdded: EventOf<'canal.added'>;
  tol: Tolerances;
  /** Current CWL: the latest `canal.cwlCorrected`, else `canal.added`; and the event that set it. */
  cwlMm: number;
  cwlEventId: string;
  /** Extracted tooth or patient: the rules marked "tooth" apply. */
  isTooth: boolean;
  tooth: number | undefined;
  thirds: CanalThirds;
  /** Ids of `accessory.placed` events withdrawn by an `accessory.removed`. */
  withdrawn: Set<string>;
  /** The latest `master.seated` (the cone in place now) and the first (when seating first happened). */
  lastSeat: At<'master.seated'> | undefined;
  firstSeat: At<'master.seated'> | undefined;
  of<T extends EventType>(type: T): At<T>[];
}

// Float-safe comparisons: every recorded length is a multiple of 0.5 mm, tolerances may not be.
const EPS = 1e-9;
export const gt = (a: number, b: number): boolean => a - b > EPS;
export const lt = (a: number, b: number): boolean => b - a > EPS;
export const differs = (a: number, b: number): boolean => Math.abs(a - b) > EPS;
/** "Differs by more than the margin" (strict). */
export const beyondMargin = (a: number, b: number, margin: number): boolean => Math.abs(a - b) - margin > EPS;
/** "Differs by at least the threshold" (inclusive). */
export const atLeast = (a: number, b: number, threshold: number): boolean => Math.abs(a - b) - threshold > -EPS;

export function latest<T>(xs: readonly T[]): T | undefined {
  return xs[xs.length - 1];
}
/** The latest of `xs` before position `i` (all of them when i is undefined). */
export function latestBefore<T extends EventType>(xs: readonly At<T>[], i: number | undefined): At<T> | undefined {
  return latest(i === undefined ? xs : xs.filter((x) => x.i < i));
}

export function buildView(canalId: string, t: Timeline, tol: Tolerances): CanalView | null {
  const byType = new Map<EventType, At<EventType>[]>();
  t.events.forEach((e, i) => {
    const list = byType.get(e.type) ?? [];
    list.push({ e, i } as At<EventType>);
    byType.set(e.type, list);
  });
  const of = <T extends EventType>(type: T): At<T>[] => (byType.get(type) ?? []) as unknown as At<T>[];

  // Where a set-up event was recorded twice (and neither voided), the latest counts.
  const caseOpened = latest(of('case.opened'))?.e;
  const canalAdded = latest(of('canal.added').filter((x) => x.e.canalId === canalId))?.e;
  if (caseOpened === undefined || canalAdded === undefined) return null;

  const correction = latest(of('canal.cwlCorrected'))?.e;
  const cwlMm = correction?.data.cwlMm ?? canalAdded.data.cwlMm;
  const isTooth = caseOpened.data.setting !== 'block';
  // A training block's top is its orifice: o = 0 when none was recorded, and not estimated.
  const orifice = canalAdded.data.orificeDepthMm ?? (isTooth ? undefined : 0);
  const seats = of('master.seated');
  return {
    events: t.events,
    caseId: t.caseId,
    canalId,
    caseOpened,
    canalAdded,
    tol,
    cwlMm,
    cwlEventId: (correction ?? canalAdded).id,
    isTooth,
    tooth: caseOpened.data.tooth,
    // On an anterior tooth the estimate scales with the tooth's average length (thirds.ts).
    thirds: canalThirds(cwlMm, orifice, tol.fallbackStopDepthMm, isTooth ? caseOpened.data.tooth : undefined),
    withdrawn: new Set(of('accessory.removed').map((x) => x.e.data.eventId)),
    lastSeat: latest(seats),
    firstSeat: seats[0],
    of,
  };
}

/** "21.5 mm"; two decimals only where the value is not on the 0.5 mm grid (estimated thirds, averages). */
export function fmtMm(v: number): string {
  const r = Math.round(v * 100) / 100;
  return `${Number.isInteger(r * 2) ? r.toFixed(1) : r.toFixed(2)} mm`;
}
