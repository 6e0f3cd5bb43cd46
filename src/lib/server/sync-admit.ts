/**
 * Who may store which event, and when: the checks /api/sync makes of each event of a batch
 * against what the server (and the batch so far) already holds. No writes here.
 */
import type { LogEvent } from '../rules/index';

export interface KnownCase {
  id: string;
  student_id: number;
  review_status: string;
}

export interface KnownEvent {
  id: string;
  case_id: string;
  canal_id: string | null;
  type: string;
}

/** What is known while a batch is processed; filled from the database, then by the batch. */
export interface Known {
  userId: number;
  /** Events already stored, by id: their normalised content and who sent them. */
  stored: Map<string, { canonical: string; user_id: number }>;
  /** Events kept earlier in this batch, by id: their normalised content. */
  kept: Map<string, string>;
  cases: Map<string, KnownCase>;
  /** Canal id → its case id. */
  canals: Map<string, string>;
  /** Events another event may name (stored, or kept earlier in this batch). */
  targets: Map<string, KnownEvent>;
  /** Ids of this batch that were not kept. */
  refused: Set<string>;
}

export type Refusal = { error: string; retry?: true };
export type Fate = { status: 'duplicate' } | { status: 'rejected'; error: string } | null;

/** An id seen before: the same content is a duplicate, other content or another sender is refused. */
export function priorFate(e: LogEvent, canonical: string, known: Known): Fate {
  const stored = known.stored.get(e.id);
  // Someone else's event: say nothing about it, not even that it exists.
  if (stored && stored.user_id !== known.userId) return { status: 'rejected', error: 'this case is not yours to write' };
  const prior = stored?.canonical ?? known.kept.get(e.id);
  if (prior === undefined) return null;
  if (prior === canonical) return { status: 'duplicate' };
  return { status: 'rejected', error: `id ${e.id} was already used for a different event; record it again with a new id` };
}

const later = (error: string): Refusal => ({ error, retry: true });

/** Why a new event may not be stored for this user now, or null when it may. */
export function refusal(e: LogEvent, known: Known): Refusal | null {
  const c = known.cases.get(e.caseId);
  if (e.type === 'case.opened') {
    if (!c) return null;
    return { error: c.student_id === known.userId ? 'this case was already opened' : 'this case id is taken; open the case again' };
  }
  if (!c) return later('the case of this event is not on the server yet; it will be sent again');
  if (c.student_id !== known.userId) return { error: 'this case is not yours to write' };
  if (c.review_status === 'approved') return { error: 'this case is signed off; ask your attending to reopen it before recording more' };
  if (e.type === 'canal.added') return known.canals.has(e.canalId!) ? { error: 'this canal was already added' } : null;
  if (e.canalId) {
    const canalCase = known.canals.get(e.canalId);
    if (canalCase === undefined) return later('the canal of this event is not on the server yet; it will be sent again');
    if (canalCase !== e.caseId) return { error: 'this canal belongs to another case' };
  }
  const ref = (e.data as { eventId?: unknown }).eventId;
  return typeof ref === 'string' ? targetRefusal(e, ref, known) : null;
}

/** Checks of a void or a withdrawn cone against the event it names. */
function targetRefusal(e: LogEvent, ref: string, known: Known): Refusal | null {
  const target = known.targets.get(ref);
  if (!target && known.refused.has(ref)) return { error: 'the event it names was refused, so there is nothing to withdraw' };
  if (!target) return later('the event it withdraws is not on the server yet; it will be sent again');
  if (target.case_id !== e.caseId) return { error: 'eventId must name an event of the same case' };
  if (e.type === 'event.voided' && target.canal_id !== (e.canalId ?? null)) {
    return { error: 'a withdrawal must name an event of its own canal, or a case-level event when it is case-level' };
  }
  if (e.type === 'accessory.removed' && (target.type !== 'accessory.placed' || target.canal_id !== e.canalId)) {
    return { error: 'eventId must name an accessory cone placed in this canal' };
  }
  return null;
}
