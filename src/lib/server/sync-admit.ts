/**
 * Who may store which event, and when: the checks /api/sync makes of each event of a batch
 * against what the server (and the batch so far) already holds. No writes here.
 */
import {
  CaseTally,
  isRefusal,
  next,
  tallyEvent,
  type CaseAction,
  type CaseState,
  type LimitBreach,
  type LogEvent,
} from '../rules/index';

export interface KnownCase {
  id: string;
  student_id: number;
  /** The lifecycle state: `discarded` while a discard stands, else the review state. */
  review_status: CaseState;
}

export interface KnownEvent {
  id: string;
  case_id: string;
  canal_id: string | null;
  type: string;
  /** Who stored it (the case's student). */
  user_id: number;
}

/** Where a known canal is, and whose it is. */
export interface KnownCanal {
  caseId: string;
  studentId: number;
}

/** What is known while a batch is processed; filled from the database, then by the batch. */
export interface Known {
  userId: number;
  /** Events already stored, by id: their normalised content and who sent them. */
  stored: Map<string, { canonical: string; user_id: number }>;
  /** Events kept earlier in this batch, by id: their normalised content. */
  kept: Map<string, string>;
  cases: Map<string, KnownCase>;
  canals: Map<string, KnownCanal>;
  /** Events another event may name (stored, or kept earlier in this batch). */
  targets: Map<string, KnownEvent>;
  /** Ids of this batch that were not kept. */
  refused: Set<string>;
  /** What each of this student's cases holds, for the limits. */
  tallies: Map<string, CaseTally>;
  /** Cases with a filled canal (a live canal with a seated master cone): they cannot be discarded. */
  filled: Set<string>;
  /**
   * The latest standing submission of each case of the batch that has one, and whether an
   * attending acted on it (a sign-off, or a comment by someone other than the student, since
   * it was received): its withdrawal is then refused.
   */
  submissions: Map<string, LatestSubmission>;
  /** The ids (as written in events) of the attendings assigned to this student; read only for a batch that names one. */
  attendings: Set<string>;
}

export interface LatestSubmission {
  eventId: string;
  acted: boolean;
}

export type Refusal = { error: string; retry?: true };
export type Fate = { status: 'duplicate' } | Refusal | null;

const later = (error: string): Refusal => ({ error, retry: true });

/**
 * The answer to an event for a case the server does not know. Someone else's case, canal or
 * event id is answered with exactly this too (the same words, the same `retry`), so that no
 * answer tells a student that an id they did not make exists.
 */
export const UNKNOWN_CASE: Readonly<Refusal> = later(
  'the case of this event is not on the server yet; it will be sent again',
);
const UNKNOWN_CANAL = later('the canal of this event is not on the server yet; it will be sent again');
const UNKNOWN_TARGET = later('the event it withdraws is not on the server yet; it will be sent again');

/** An id seen before: the same content is a duplicate, other content is refused; someone else's id is not known. */
export function priorFate(e: LogEvent, canonical: string, known: Known): Fate {
  const stored = known.stored.get(e.id);
  if (stored && stored.user_id !== known.userId) return UNKNOWN_CASE;
  const prior = stored?.canonical ?? known.kept.get(e.id);
  if (prior === undefined) return null;
  if (prior === canonical) return { status: 'duplicate' };
  return { error: `id ${e.id} was already used for a different event; record it again with a new id` };
}

/** Why a new event may not be stored for this user now, or null when it may. */
export function refusal(e: LogEvent, known: Known): Refusal | null {
  const c = known.cases.get(e.caseId);
  const mine = c?.student_id === known.userId;
  if (e.type === 'case.opened') {
    if (!c) return null;
    return mine ? { error: 'this case was already opened' } : UNKNOWN_CASE;
  }
  if (!c || !mine) return UNKNOWN_CASE;
  // The lifecycle decides whether the case takes the event at all (a signed-off one takes none).
  const action = lifecycleAction(e, known);
  const lifecycle = next(c.review_status, action);
  if (isRefusal(lifecycle)) return { error: lifecycle.refused };
  if (action === 'discard' && known.filled.has(e.caseId)) {
    return {
      error:
        'this case has a filled canal (a master cone is seated), so it stays on the record; ask your attending if it was opened by mistake',
    };
  }
  const canal = e.canalId === undefined ? undefined : known.canals.get(e.canalId);
  const ours = canal?.studentId === known.userId;
  if (e.type === 'canal.added') {
    if (!canal) return null;
    return ours ? { error: 'this canal was already added' } : UNKNOWN_CASE;
  }
  if (e.canalId !== undefined) {
    if (!canal || !ours) return UNKNOWN_CANAL;
    if (canal.caseId !== e.caseId) return { error: 'this canal belongs to another case' };
  }
  // An approval at the chair names an attending of the student's (docs/review.md): the same
  // words whether the id is nobody's, a student's or another student's attending.
  if (e.type === 'conefit.approvedAtChair' && !known.attendings.has(e.data.attendingId))
    return { error: NOT_YOUR_ATTENDING };
  const ref = (e.data as { eventId?: unknown }).eventId;
  return typeof ref === 'string' ? targetRefusal(e, ref, known) : null;
}

export const NOT_YOUR_ATTENDING =
  'attendingId must name an attending assigned to you: only they can approve your cone fit at the chair; pick one of your attendings';

/**
 * What an event does to its case's lifecycle: submit it, withdraw its latest submission
 * (`withdrawReviewed` once the attending acted on it), discard it, restore it (voiding its
 * discard), attach to an earlier radiograph, or record.
 */
export function lifecycleAction(e: LogEvent, known: Known): CaseAction {
  if (e.type === 'case.discarded') return 'discard';
  if (e.type === 'case.submitted') return 'submit';
  if (e.type === 'event.voided' && e.canalId === undefined) {
    const found = known.targets.get(e.data.eventId);
    const target = found?.user_id === known.userId ? found : undefined;
    if (target?.type === 'case.discarded') return 'restore';
    const latest = known.submissions.get(e.caseId);
    if (target?.type === 'case.submitted' && latest?.eventId === target.id)
      return latest.acted ? 'withdrawReviewed' : 'withdraw';
  }
  if (attachesToEarlierRadiograph(e)) return 'attach';
  return 'record';
}

/**
 * Whether an event only attaches something to a radiograph recorded before the latest
 * submission (an upload or a reading of it), which a case waiting for review still takes.
 * No event type does so yet: `radiograph.taken` records a new radiograph (its optional
 * `radiographId` names the upload made with it), so it waits like any step. An upload or
 * reading event naming an earlier `radiograph.taken` will answer true here (docs/lifecycle.md).
 */
export function attachesToEarlierRadiograph(e: LogEvent): boolean {
  void e;
  return false;
}

/** Checks of a void or a withdrawn cone against the event it names. */
function targetRefusal(e: LogEvent, ref: string, known: Known): Refusal | null {
  const found = known.targets.get(ref);
  const target = found?.user_id === known.userId ? found : undefined;
  if (!target && known.refused.has(ref))
    return { error: 'the event it names was refused, so there is nothing to withdraw' };
  if (!target) return UNKNOWN_TARGET;
  if (target.case_id !== e.caseId) return { error: 'eventId must name an event of the same case' };
  if (e.type === 'event.voided' && target.canal_id !== (e.canalId ?? null)) {
    return { error: 'a withdrawal must name an event of its own canal, or a case-level event when it is case-level' };
  }
  if (e.type === 'accessory.removed' && (target.type !== 'accessory.placed' || target.canal_id !== e.canalId)) {
    return { error: 'eventId must name an accessory cone placed in this canal' };
  }
  return null;
}

function tallyOfCase(known: Known, caseId: string): CaseTally {
  let tally = known.tallies.get(caseId);
  if (!tally) known.tallies.set(caseId, (tally = new CaseTally()));
  return tally;
}

/** The limit (limits.ts) storing an otherwise admissible event would pass, or null. */
export function limitBreach(e: LogEvent, known: Known): LimitBreach | null {
  return tallyOfCase(known, e.caseId).breach(tallyEvent(e));
}

/** Notes a kept event: later events of the batch may name it, and it counts toward the limits. */
export function keep(e: LogEvent, known: Known): void {
  known.targets.set(e.id, {
    id: e.id,
    case_id: e.caseId,
    canal_id: e.canalId ?? null,
    type: e.type,
    user_id: known.userId,
  });
  tallyOfCase(known, e.caseId).add(tallyEvent(e));
}
