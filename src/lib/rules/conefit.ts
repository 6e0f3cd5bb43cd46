// The cone fit at the chair (docs/review.md, "Cone fit at the chair"): where a canal's cone-fit
// check stands and whether its master cone was seated after an approval. Two kinds of fact
// meet here: the student's events (`conefit.requested`, `conefit.approvedAtChair`) and the
// attending's `cone-fit` sign-offs, which are the server's and come in beside the events.
// Events are ordered among themselves by their `at` (the tablet's clock), sign-offs by theirs
// (the server's). A record is set against the sign-offs by when the server received it, where
// that is known (the server passes it in), as the review queue reads it: a sign-off answers only
// what the attending could have seen.
import type { EventOf, LogEvent } from './events';
import { raise, type Finding } from './severities';
import type { Tolerances } from './tolerances';

/** One `cone-fit` sign-off of a canal, as the rules need it (a reader may pass more fields). */
export interface ConeFitSignoff {
  decision: 'approved' | 'returned';
  /** When it was made (ISO 8601, the server's clock). */
  at: string;
}

/** What the server knows of a canal besides its events: its `cone-fit` sign-offs, any order. */
export interface CanalReview<S extends ConeFitSignoff = ConeFitSignoff> {
  coneFit: readonly S[];
  /**
   * When the server received each of the canal's cone-fit records (event id → ISO 8601). A
   * record not listed (on the tablet, which does not know) counts from its own `at`.
   */
  received?: Readonly<Record<string, string>>;
}

/**
 * - `none`: nothing asked or decided;
 * - `waiting`: the student asked and the attending has not decided since;
 * - `at-chair`: the student recorded an approval at the chair the attending has not confirmed;
 * - `approved`, `returned`: the attending's latest `cone-fit` sign-off, nothing recorded since.
 */
export type ConeFitStatus = 'none' | 'waiting' | 'at-chair' | 'approved' | 'returned';

export interface ConeFitStanding<S extends ConeFitSignoff = ConeFitSignoff> {
  status: ConeFitStatus;
  /** The attending has something to do: a request or an at-chair record later than the latest sign-off. */
  pending: boolean;
  /** The request or at-chair record behind `waiting` or `at-chair`. */
  record?: EventOf<'conefit.requested'> | EventOf<'conefit.approvedAtChair'>;
  /** The latest sign-off (behind `approved` and `returned`, and the one a pending record is later than). */
  signoff?: S;
  /** The canal may be sealed now: its latest cone-fit decision is an approval. */
  approved: boolean;
}

const ms = (at: string): number => Date.parse(at);

type Record_ = EventOf<'conefit.requested'> | EventOf<'conefit.approvedAtChair'>;
type AtChair = EventOf<'conefit.approvedAtChair'>;

/** The sign-offs in time order (ties keep the order given, which readers give oldest first). */
function inOrder<S extends ConeFitSignoff>(signoffs: readonly S[]): S[] {
  return signoffs
    .map((s, i) => ({ s, i }))
    .sort((a, b) => ms(a.s.at) - ms(b.s.at) || a.i - b.i)
    .map((x) => x.s);
}

/** When a record counts against the sign-offs (ms): when the server received it, else its `at`. */
type RecordTime = (e: Record_) => number;
const recordTime =
  (received: CanalReview['received']): RecordTime =>
  (e) =>
    ms(received?.[e.id] ?? e.at);

/** Whether an at-chair record is disputed: the latest sign-off after it is a return. */
function disputed(record: AtChair, ordered: readonly ConeFitSignoff[], time: RecordTime): boolean {
  const after = ordered.filter((s) => ms(s.at) > time(record));
  return after.at(-1)?.decision === 'returned';
}

/**
 * Whether the latest cone-fit decision made by `until` (an instant, ms) is an approval: an
 * `approved` sign-off, or an at-chair record that no later return disputes (a dispute may
 * come after `until`: the attending learns of the record later). A request decides nothing.
 */
function approvedBy(
  until: number,
  atChair: readonly AtChair[],
  ordered: readonly ConeFitSignoff[],
  time: RecordTime,
): boolean {
  const lastSignoff = ordered.filter((s) => ms(s.at) <= until).at(-1);
  const lastRecord = atChair.filter((e) => ms(e.at) <= until).at(-1);
  if (lastRecord !== undefined && (lastSignoff === undefined || time(lastRecord) > ms(lastSignoff.at)))
    return !disputed(lastRecord, ordered, time);
  return lastSignoff?.decision === 'approved';
}

/**
 * Where one canal's cone-fit check stands. `events` are the canal's events that count (voids
 * applied, e.g. a CanalReading's `counted`); `signoffs` its `cone-fit` sign-offs; `received`
 * as in CanalReview.
 * Example: `coneFitStanding(reading.counted, [{ decision: 'approved', at }]).status === 'approved'`.
 */
export function coneFitStanding<S extends ConeFitSignoff>(
  events: readonly LogEvent[],
  signoffs: readonly S[],
  received?: CanalReview['received'],
): ConeFitStanding<S> {
  const time = recordTime(received);
  const records = events.filter(
    (e): e is Record_ => e.type === 'conefit.requested' || e.type === 'conefit.approvedAtChair',
  );
  const atChair = records.filter((e): e is AtChair => e.type === 'conefit.approvedAtChair');
  const ordered = inOrder(signoffs);
  const record = records.reduce<Record_ | undefined>((a, e) => (a && time(a) > time(e) ? a : e), undefined);
  const signoff = ordered.at(-1);
  const pending = record !== undefined && (signoff === undefined || time(record) > ms(signoff.at));
  const status: ConeFitStatus = pending
    ? record.type === 'conefit.requested'
      ? 'waiting'
      : 'at-chair'
    : (signoff?.decision ?? 'none');
  return {
    status,
    pending,
    ...(pending ? { record } : {}),
    ...(signoff ? { signoff } : {}),
    approved: approvedBy(Number.POSITIVE_INFINITY, atChair, ordered, time),
  };
}

/**
 * `cone-fit-not-approved`: while `requireConeFitApproval` is 1, the latest seating of the
 * master cone came when the latest cone-fit decision was not an approval. `events` are the
 * canal's events that count, in rules order; `received` as in CanalReview.
 */
export function coneFitChecks(
  events: readonly LogEvent[],
  tol: Pick<Tolerances, 'requireConeFitApproval'>,
  signoffs: readonly ConeFitSignoff[],
  received?: CanalReview['received'],
): Finding[] {
  if (!(tol.requireConeFitApproval >= 1)) return [];
  const seat = events.findLast((e) => e.type === 'master.seated');
  if (seat === undefined) return [];
  const atChair = events.filter((e): e is AtChair => e.type === 'conefit.approvedAtChair');
  const ordered = inOrder(signoffs);
  const time = recordTime(received);
  const at = ms(seat.at);
  if (approvedBy(at, atChair, ordered, time)) return [];
  const lastRecord = atChair.filter((e) => ms(e.at) <= at).at(-1);
  const returned = ordered.filter((s) => ms(s.at) <= at).at(-1)?.decision === 'returned';
  const message =
    lastRecord !== undefined && disputed(lastRecord, ordered, time)
      ? 'Your attending disputes the approval at the chair recorded before you seated the master cone with sealer: read their comment and talk to them; they decide what comes next.'
      : returned
        ? 'You seated the master cone with sealer after your attending returned the cone fit: read their comment and show them the canal; they decide what comes next.'
        : 'You seated the master cone with sealer before your attending approved the cone fit, which your school asks for: show them the cone fit now; they decide what comes next.';
  return [raise('cone-fit-not-approved', message, seat.id)];
}
