// How much one case and one sync batch may hold: declared once, for the server (the verdict
// of record), the tablet (which refuses a tap past a limit before saving it) and the tests
// (which compare these numbers with docs/sync-contract.md). Pure: no I/O.

export const LIMITS = {
  /** Canals of one case whose set-up stands (a withdrawn canal.added frees its place). */
  canalsPerCase: 8,
  /** Stored events naming one canal, withdrawals included. */
  eventsPerCanal: 400,
  /** Stored case-level events (no canalId) of one case, withdrawals included. */
  caseLevelEventsPerCase: 100,
  /** Events in one sync batch. */
  eventsPerBatch: 500,
  /** Bytes of one sync batch's body (1 MB). */
  bytesPerBatch: 1024 * 1024,
} as const;

export type CaseLimit = 'canalsPerCase' | 'eventsPerCanal' | 'caseLevelEventsPerCase';

/** What a student reads when a limit refuses an event: what happened and what to do. */
export const LIMIT_MESSAGES: Readonly<Record<CaseLimit, string>> = {
  canalsPerCase: `this case already has ${LIMITS.canalsPerCase} canals, the most one case may hold; withdraw the set-up of a canal added by mistake before adding another`,
  eventsPerCanal: `this canal already holds ${LIMITS.eventsPerCanal} recorded events (withdrawn ones included), the most one canal may hold; nothing more can be recorded on it, so ask your attending how to go on`,
  caseLevelEventsPerCase: `this case already holds ${LIMITS.caseLevelEventsPerCase} case-level events (withdrawn ones included), the most one case may hold; record further notes on a canal instead`,
};

export interface LimitBreach {
  limit: CaseLimit;
  error: string;
}

/** What the limits need of an event: which canal it names, and what a withdrawal names. */
export interface TallyEvent {
  id: string;
  type: string;
  /** Absent or null for a case-level event. */
  canalId?: string | null;
  /** For `event.voided`: the event it withdraws. */
  eventId?: string;
}

/** The limits' view of an event in the shape the rules and the wire use. */
export function tallyEvent(e: { id: string; type: string; canalId?: string; data?: unknown }): TallyEvent {
  const target = (e.data as { eventId?: unknown } | undefined)?.eventId;
  return {
    id: e.id,
    type: e.type,
    canalId: e.canalId ?? null,
    ...(e.type === 'event.voided' && typeof target === 'string' ? { eventId: target } : {}),
  };
}

/**
 * What one case holds, as the limits count it. Events per canal are all stored events naming
 * the canal, withdrawals included: simple, and a student cannot free room by withdrawing.
 * Which canals stand follows the rules' own reading of withdrawals (timeline.ts): a
 * `canal.added` is withdrawn by an `event.voided` of its canal that no other void names.
 */
export class CaseTally {
  private readonly perCanal = new Map<string, number>();
  private caseLevel = 0;
  /** canal.added and canal-level event.voided events: what decides which canals stand. */
  private readonly setUps = new Map<string, TallyEvent>();
  private live: Set<string> | null = null;

  /** Counts one stored event. */
  add(e: TallyEvent): void {
    this.addCount(e.canalId ?? null, 1);
    this.remember(e);
  }

  /** Counts `n` stored events of a canal, or case-level ones for null, without their content. */
  addCount(canalId: string | null, n: number): void {
    if (canalId === null) this.caseLevel += n;
    else this.perCanal.set(canalId, (this.perCanal.get(canalId) ?? 0) + n);
  }

  /** Remembers a stored set-up or withdrawal without counting it (counted apart by addCount). */
  remember(e: TallyEvent): void {
    if (!e.canalId || (e.type !== 'canal.added' && e.type !== 'event.voided')) return;
    this.setUps.set(e.id, e);
    this.live = null;
  }

  /** The canals whose set-up stands. */
  liveCanals(): ReadonlySet<string> {
    this.live ??= standing(this.setUps.values());
    return this.live;
  }

  /** The limit storing `e` would pass, or null when it may be stored. */
  breach(e: TallyEvent): LimitBreach | null {
    const full = e.canalId
      ? (this.perCanal.get(e.canalId) ?? 0) >= LIMITS.eventsPerCanal && 'eventsPerCanal'
      : this.caseLevel >= LIMITS.caseLevelEventsPerCase && 'caseLevelEventsPerCase';
    if (full) return { limit: full, error: LIMIT_MESSAGES[full] };
    if (e.canalId && (e.type === 'canal.added' || e.type === 'event.voided')) {
      // A set-up, or a withdrawal of the withdrawal of one, may bring a canal into the case.
      const before = this.liveCanals().size;
      const after = standing([...this.setUps.values(), e]).size;
      if (after > before && after > LIMITS.canalsPerCase)
        return { limit: 'canalsPerCase', error: LIMIT_MESSAGES.canalsPerCase };
    }
    return null;
  }
}

/** Canals whose canal.added no standing void of the same canal withdraws (one level, as timeline.ts). */
function standing(events: Iterable<TallyEvent>): Set<string> {
  const all = [...events];
  const byId = new Map(all.map((e) => [e.id, e]));
  const voids = all.filter((e) => e.type === 'event.voided');
  const named = new Set(voids.map((v) => v.eventId));
  const withdrawn = new Set<string>();
  for (const v of voids) {
    if (named.has(v.id) || v.eventId === undefined) continue;
    const target = byId.get(v.eventId);
    if (target?.type === 'canal.added' && target.canalId === v.canalId) withdrawn.add(target.id);
  }
  return new Set(all.filter((e) => e.type === 'canal.added' && !withdrawn.has(e.id)).map((e) => e.canalId!));
}

/** The tally of a case from all of its events (the tablet's log). */
export function tallyOf(events: Iterable<{ id: string; type: string; canalId?: string; data?: unknown }>): CaseTally {
  const tally = new CaseTally();
  for (const e of events) tally.add(tallyEvent(e));
  return tally;
}
