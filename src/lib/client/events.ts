/**
 * Reading the event log on the tablet: which events still count (not voided), the case's
 * opening, its canals. The rules core judges; these helpers only select and order.
 */
export interface FlowEvent {
  id: string;
  caseId: string;
  canalId?: string;
  type: string;
  at: string;
  data?: object;
}

/** A field of an event's data, typed loosely (the schema in lib/rules checked it). */
export function field<T = unknown>(e: FlowEvent | undefined, key: string): T | undefined {
  return (e?.data as Record<string, unknown> | undefined)?.[key] as T | undefined;
}

/** Order events as the rules do: by `at` as an instant, then by id. */
export function byTime<T extends FlowEvent>(a: T, b: T): number {
  const d = Date.parse(a.at) - Date.parse(b.at);
  return d !== 0 ? d : a.id < b.id ? -1 : a.id > b.id ? 1 : 0;
}

/** The ids withdrawn by `event.voided` (a void that was itself voided withdraws nothing). */
export function voidedIds(events: FlowEvent[]): Set<string> {
  const voids = events.filter((e) => e.type === 'event.voided');
  const targeted = new Set(voids.map((v) => field<string>(v, 'eventId')).filter((x): x is string => !!x));
  const active = voids.filter((v) => !targeted.has(v.id));
  return new Set(active.map((v) => field<string>(v, 'eventId')).filter((x): x is string => !!x));
}

/** Events that still count, in rule order, without the `event.voided` records themselves. */
export function liveEvents<T extends FlowEvent>(events: T[]): T[] {
  const gone = voidedIds(events);
  return events.filter((e) => e.type !== 'event.voided' && !gone.has(e.id)).sort(byTime);
}

export type Setting = 'block' | 'extracted' | 'patient';

export interface CaseInfo {
  caseId: string;
  setting: Setting;
  tooth?: number;
  chartRef?: string;
  openedAt: string;
  submitted: boolean;
}

/** Every case in a user's log, newest first. */
export function casesIn(events: FlowEvent[]): CaseInfo[] {
  const live = liveEvents(events);
  const submitted = new Set(live.filter((e) => e.type === 'case.submitted').map((e) => e.caseId));
  return live
    .filter((e) => e.type === 'case.opened')
    .map((e) => ({
      caseId: e.caseId,
      setting: field<Setting>(e, 'setting') ?? 'block',
      tooth: field<number>(e, 'tooth'),
      chartRef: field<string>(e, 'chartRef'),
      openedAt: e.at,
      submitted: submitted.has(e.caseId),
    }))
    .sort((a, b) => Date.parse(b.openedAt) - Date.parse(a.openedAt));
}

export interface CanalInfo {
  canalId: string;
  name: string;
  addedEventId: string;
  cwlMm: number;
  mafSize: string;
  spreader?: string;
  accessorySize?: string;
  sealer?: string;
}

/** The canals of one case in the order they were added. */
export function canalsIn(events: FlowEvent[], caseId: string): CanalInfo[] {
  const live = liveEvents(events).filter((e) => e.caseId === caseId);
  return live
    .filter((e) => e.type === 'canal.added' && e.canalId)
    .map((e) => {
      const corrected = live.filter((c) => c.type === 'canal.cwlCorrected' && c.canalId === e.canalId).pop();
      return {
        canalId: e.canalId!,
        name: field<string>(e, 'name') ?? 'Canal',
        addedEventId: e.id,
        cwlMm: field<number>(corrected, 'cwlMm') ?? field<number>(e, 'cwlMm') ?? 0,
        mafSize: String(field(e, 'mafSize') ?? ''),
        spreader: field<string>(e, 'spreader'),
        accessorySize: field<string>(e, 'accessorySize'),
        sealer: field<string>(e, 'sealer'),
      };
    });
}
