// Parsing one raw event, and its canonical form for duplicate detection. No zod (see core.ts).
import { FUTURE_AT_MESSAGE, isTooFarAhead, type LogEvent } from './events';
import { readEvent } from './read';

/**
 * Validates and normalises one raw event. Never throws: the error is one plain sentence
 * naming the field and what is allowed. `now` (default: this device's clock) is the clock
 * `at` may not run more than 24 h ahead of. The sentence is the first problem's message
 * (every message is ours).
 */
export function parseEvent(
  raw: unknown,
  now: Date = new Date(),
): { ok: true; event: LogEvent } | { ok: false; error: string } {
  try {
    const r = readEvent(raw);
    if (!r.ok) return { ok: false, error: r.issues[0]?.message ?? 'the event is not valid' };
    if (isTooFarAhead(r.event.at, now)) return { ok: false, error: FUTURE_AT_MESSAGE };
    return r;
  } catch {
    // A getter or proxy in `raw` that throws: not an event we can read.
    return { ok: false, error: 'the event could not be read' };
  }
}

function sortKeys(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(sortKeys);
  if (v !== null && typeof v === 'object') {
    const out: Record<string, unknown> = {};
    for (const k of Object.keys(v).sort()) {
      const x = (v as Record<string, unknown>)[k];
      if (x !== undefined) out[k] = sortKeys(x);
    }
    return out;
  }
  return v;
}

/**
 * Stable JSON of a normalised event: keys sorted at every level, absent fields left out.
 * Two sends of the same event give the same string; an id re-used with other content does not.
 */
export function canonicalEvent(e: LogEvent): string {
  return JSON.stringify(sortKeys(e));
}
