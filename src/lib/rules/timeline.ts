// Which events the rules see for one canal, and in what order.
import { EVENT_TYPES, type LogEvent } from './events';
import { canonicalEvent } from './parse';

const TYPES = new Set<string>(EVENT_TYPES);

/** Milliseconds of `at` as an instant (offsets honoured). */
export function instant(e: LogEvent): number {
  return Date.parse(e.at);
}

/** Order of the rules: `at` as an instant, then id. */
export function compareEvents(a: LogEvent, b: LogEvent): number {
  const d = instant(a) - instant(b);
  if (d !== 0) return d;
  return a.id < b.id ? -1 : a.id > b.id ? 1 : 0;
}

/** Just enough shape to be read safely; full validation is parseEvent's job. */
function looksLikeEvent(e: unknown): e is LogEvent {
  if (e === null || typeof e !== 'object') return false;
  const r = e as Record<string, unknown>;
  return (
    typeof r.id === 'string' &&
    typeof r.caseId === 'string' &&
    typeof r.type === 'string' &&
    TYPES.has(r.type) &&
    (r.canalId === undefined || typeof r.canalId === 'string') &&
    typeof r.at === 'string' &&
    Number.isFinite(Date.parse(r.at)) &&
    r.data !== null &&
    typeof r.data === 'object'
  );
}

/** One event per id; where an id comes twice with different content, the same one is kept whatever the order. */
function dedupe(events: readonly LogEvent[]): LogEvent[] {
  const byId = new Map<string, { e: LogEvent; key?: string }>();
  for (const e of events) {
    const seen = byId.get(e.id);
    if (seen === undefined) {
      byId.set(e.id, { e });
      continue;
    }
    const key = canonicalEvent(e);
    seen.key ??= canonicalEvent(seen.e);
    if (key < seen.key) byId.set(e.id, { e, key });
  }
  return [...byId.values()].map((x) => x.e);
}

export interface Timeline {
  caseId: string;
  /** Case-level events and this canal's, voided events and the voids themselves removed, in rules order. */
  events: LogEvent[];
}

/**
 * The events of one scope with the withdrawn ones and the withdrawals removed. An
 * `event.voided` voids an event of its own scope (the same canal, or both case-level); a void
 * that is itself the target of a void does not void anything (one level, so the result never
 * depends on the order voids are read). `scoped` is in rules order and holds one scope's events.
 */
function withoutVoided(scoped: LogEvent[]): LogEvent[] {
  const byId = new Map(scoped.map((e) => [e.id, e]));
  const voids = scoped.filter((e): e is Extract<LogEvent, { type: 'event.voided' }> => e.type === 'event.voided');
  const targetedByVoid = new Set(voids.map((v) => v.data.eventId));
  const voided = new Set<string>();
  for (const v of voids) {
    if (targetedByVoid.has(v.id)) continue;
    const target = byId.get(v.data.eventId);
    if (target !== undefined && target.canalId === v.canalId) voided.add(target.id);
  }
  return scoped.filter((e) => e.type !== 'event.voided' && !voided.has(e.id));
}

/**
 * The events that count for one canal. The case is the one its earliest `canal.added` names;
 * the canal's own events and the case's case-level events, voids applied as withoutVoided says.
 */
export function canalTimeline(canalId: string, input: readonly unknown[]): Timeline | null {
  const all = dedupe(input.filter(looksLikeEvent)).sort(compareEvents);
  const added = all.find((e) => e.type === 'canal.added' && e.canalId === canalId);
  if (added === undefined) return null;
  const caseId = added.caseId;
  const scoped = all.filter((e) => e.caseId === caseId && (e.canalId === undefined || e.canalId === canalId));
  return { caseId, events: withoutVoided(scoped) };
}

/**
 * The case-level events of one case that count (those without a `canalId`), in rules order,
 * by the same void rules as a canal's: what every canal of the case sees besides its own.
 * Example: `caseTimeline(id, events).some((e) => e.type === 'case.submitted')`.
 */
export function caseTimeline(caseId: string, input: readonly unknown[]): LogEvent[] {
  const scoped = dedupe(input.filter(looksLikeEvent))
    .filter((e) => e.caseId === caseId && e.canalId === undefined)
    .sort(compareEvents);
  return withoutVoided(scoped);
}
