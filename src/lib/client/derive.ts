import { caseTimeline, compareEvents, readCanal, type CanalReading, type LogEvent } from '../rules/core';
import type { StoredEvent } from './outbox';

/**
 * What the island shows of the tablet's log, all of it derived by the rules core: which
 * events count (voids), each canal's state and findings, the cases and their canals. Nothing
 * here re-reads the events by other rules; it only groups rows and remembers results.
 */
export type Setting = 'block' | 'extracted' | 'patient';

export interface CaseInfo {
  caseId: string;
  setting: Setting;
  tooth?: number;
  chartRef?: string;
  openedAt: string;
  submitted: boolean;
  /** A `case.discarded` stands: the case leaves the list (undoing the discard brings it back). */
  discarded: boolean;
}

/** One canal as the cards use it: the rules core's reading plus the set-up fields they show. */
export interface CanalInfo {
  canalId: string;
  name: string;
  /** The current CWL (the latest correction, else the set-up's). */
  cwlMm: number;
  mafSize: string;
  spreader?: string;
  accessorySize?: string;
  sealer?: string;
  reading: CanalReading;
}

/** The open case as the island shows it. */
export interface TabletCase {
  caseId: string | null;
  /** The case's events that count on this tablet (rejected ones were never stored), any order. */
  events: LogEvent[];
  /** The case's case-level events that count, in rules order. */
  caseLevel: LogEvent[];
  info: CaseInfo | null;
  canals: CanalInfo[];
}

export const NO_CASE: TabletCase = { caseId: null, events: [], caseLevel: [], info: null, canals: [] };

/** The events of one case that count on this tablet (rejected ones were never stored). */
export function caseEvents(rows: readonly StoredEvent[], caseId: string | null): LogEvent[] {
  if (!caseId) return [];
  return rows.filter((r) => r.event.caseId === caseId && r.state !== 'rejected').map((r) => r.event);
}

/** A case's opening and submission, from its case-level events that count; null without a standing `case.opened`. */
export function caseInfo(caseId: string, caseLevel: readonly LogEvent[]): CaseInfo | null {
  // Where the opening was recorded twice (neither voided), the latest counts, as in the rules.
  const opened = [...caseLevel].reverse().find((e) => e.type === 'case.opened');
  if (opened?.type !== 'case.opened') return null;
  const { setting, tooth, chartRef } = opened.data;
  return {
    caseId,
    setting,
    ...(tooth === undefined ? {} : { tooth }),
    ...(chartRef === undefined ? {} : { chartRef }),
    openedAt: opened.at,
    submitted: caseLevel.some((e) => e.type === 'case.submitted'),
    discarded: caseLevel.some((e) => e.type === 'case.discarded'),
  };
}

/** Every case on the tablet (rejected events left out), newest first. */
export function casesOnTablet(rows: readonly StoredEvent[]): CaseInfo[] {
  const byCase = new Map<string, LogEvent[]>();
  for (const r of rows) {
    if (r.state === 'rejected') continue;
    const list = byCase.get(r.event.caseId) ?? [];
    list.push(r.event);
    byCase.set(r.event.caseId, list);
  }
  return [...byCase]
    .map(([caseId, events]) => caseInfo(caseId, caseTimeline(caseId, events)))
    .filter((c): c is CaseInfo => c !== null && !c.discarded)
    .sort((a, b) => Date.parse(b.openedAt) - Date.parse(a.openedAt));
}

function toInfo(reading: CanalReading): CanalInfo {
  const s = reading.result.state;
  return {
    canalId: reading.result.canalId,
    name: s.name,
    cwlMm: s.cwlMm,
    mafSize: s.mafSize,
    ...(s.spreader === undefined ? {} : { spreader: s.spreader }),
    ...(s.accessorySize === undefined ? {} : { accessorySize: s.accessorySize }),
    ...(s.sealer === undefined ? {} : { sealer: s.sealer }),
    reading,
  };
}

/**
 * Remembers each canal's reading while its inputs (its own events and the case-level ones)
 * stay the same, so a tap on one canal evaluates that canal once and leaves the others be.
 */
export class CanalMemo {
  private readonly byCanal = new Map<string, { key: string; info: CanalInfo | null }>();
  /** How many times the rules core was asked (tests count it). */
  evaluations = 0;

  canal(canalId: string, inputs: readonly LogEvent[]): CanalInfo | null {
    // Events are never edited, so the ids in order name the input exactly.
    const key = inputs.map((e) => e.id).join(',');
    const seen = this.byCanal.get(canalId);
    if (seen?.key === key) return seen.info;
    this.evaluations++;
    const reading = readCanal(canalId, inputs);
    const info = reading === null ? null : toInfo(reading);
    this.byCanal.set(canalId, { key, info });
    return info;
  }

  clear(): void {
    this.byCanal.clear();
  }
}

/** The open case: its events, case-level timeline, opening, and canals in set-up order. */
export function deriveCase(rows: readonly StoredEvent[], caseId: string | null, memo: CanalMemo): TabletCase {
  if (!caseId) return NO_CASE;
  const events = caseEvents(rows, caseId);
  const caseLevel = caseTimeline(caseId, events);
  const byCanal = new Map<string, LogEvent[]>();
  const shared: LogEvent[] = [];
  for (const e of events) {
    if (e.canalId === undefined) shared.push(e);
    else {
      const own = byCanal.get(e.canalId);
      if (own) own.push(e);
      else byCanal.set(e.canalId, [e]);
    }
  }
  const canals: { info: CanalInfo; added: LogEvent }[] = [];
  for (const [canalId, own] of byCanal) {
    if (!own.some((e) => e.type === 'canal.added')) continue;
    const info = memo.canal(canalId, [...shared, ...own]);
    const added = info?.reading.counted.find((e) => e.type === 'canal.added' && e.canalId === canalId);
    if (info && added) canals.push({ info, added });
  }
  canals.sort((a, b) => compareEvents(a.added, b.added));
  return { caseId, events, caseLevel, info: caseInfo(caseId, caseLevel), canals: canals.map((c) => c.info) };
}
