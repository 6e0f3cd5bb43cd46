// A timeline in words for the case page: each event with its time, its line, whether it was
// withdrawn, and the findings it raised (open, or put right since) — a finding shown beside
// the event that raised it. Pure: the page hands it the stored events and the finding history.
import type { Finding, Severity } from '../rules/core';
import { describeEvent, withdrawals, type DescribedEvent } from './events';
import { findingTitle } from './findings';
import { formatInstant, type Clinic, type InstantStyle } from './format';

/** A finding beside the event that raised it. */
export interface LineFinding {
  code: string;
  severity: Severity;
  title: string;
  /** When it was put right, in the clinic's words; null while it is open. */
  cleared: string | null;
}

/** One event of a timeline, in words. */
export interface TimelineLine {
  id: string;
  /** Its time in the clinic's zone. */
  time: string;
  words: string;
  /** Withdrawn by a later event (shown struck through). */
  withdrawn: boolean;
  findings: LineFinding[];
}

/** A finding as the history keeps it: raised (by an event, where there is one) and maybe cleared. */
export interface RaisedFinding {
  code: string;
  severity: Severity;
  eventId: string | null;
  raisedAt: string;
  clearedAt: string | null;
}

/** Where a case-level event raised findings on several canals, each names its canal ("D canal"). */
type Named<T> = T & { canal?: string };

type TimelineEvent = DescribedEvent & { id: string; at: string };

/**
 * The lines of `events` (one canal's, or the case-level ones), in their order. `open` are the
 * findings standing now; `history` every finding ever raised, of which the cleared ones are
 * shown struck through beside the event that raised them.
 */
export function timelineLines(
  events: readonly TimelineEvent[],
  open: readonly Named<Finding>[],
  history: readonly Named<RaisedFinding>[],
  clinic: Clinic,
  style: InstantStyle = 'time',
): TimelineLine[] {
  const taken = new Map(withdrawals(events).map((t) => [t.id, t]));
  const voided = new Set(
    events.flatMap((e) =>
      e.type === 'event.voided' && typeof (e.data as { eventId?: unknown })?.eventId === 'string'
        ? [(e.data as { eventId: string }).eventId]
        : [],
    ),
  );
  const raised = new Map<string, LineFinding[]>();
  const title = (f: Named<{ code: string }>) =>
    f.canal ? `${findingTitle(f.code)} (${f.canal})` : findingTitle(f.code);
  const put = (eventId: string | undefined | null, f: LineFinding) => {
    if (!eventId) return;
    raised.set(eventId, [...(raised.get(eventId) ?? []), f]);
  };
  for (const h of history)
    if (h.clearedAt !== null)
      put(h.eventId, {
        code: h.code,
        severity: h.severity,
        title: title(h),
        cleared: formatInstant(h.clearedAt, clinic),
      });
  for (const f of open) put(f.eventId, { code: f.code, severity: f.severity, title: title(f), cleared: null });
  return events.map((e) => {
    const t = taken.get(e.id);
    return {
      id: e.id,
      time: formatInstant(e.at, clinic, style),
      words: t ? `${t.kind === 'withdrawn' ? 'Withdrawn' : 'Removed'}: ${t.what} (${t.why})` : describeEvent(e),
      withdrawn: voided.has(e.id),
      findings: raised.get(e.id) ?? [],
    };
  });
}

/** The event that raised a finding, as "10:42 · Spreader MF: 22.0 mm", or null when none did. */
export function raisedBy(line: TimelineLine | undefined): string | null {
  return line ? `${line.time} · ${line.words}` : null;
}
