// The case lifecycle: the states a case is in and the actions that move it, as one table.
// The server decides every change of a case's status through next(); the pages show the
// labels below. A new transition is a new row here, never a check written elsewhere.

export const CASE_STATES = ['open', 'submitted', 'returned', 'approved', 'discarded'] as const;
export type CaseState = (typeof CASE_STATES)[number];

/**
 * What can happen to a case:
 * - `record`: a new event of the student's (a step, a note, a withdrawal); moves nothing.
 * - `attach`: an event that only attaches to a radiograph recorded before the latest
 *   submission (an upload or a reading of it); moves nothing. No event type does this yet.
 * - `submit`: a `case.submitted` stands.
 * - `withdraw`: the latest submission no longer stands (its `case.submitted` was voided)
 *   before the attending acted on it.
 * - `withdrawReviewed`: the same, after the attending acted on it (a sign-off or a comment
 *   since the submission).
 * - `return`, `approve`: an attending's final review.
 * - `checkpoint`: an attending's sign-off of a cone fit or a fill check; moves nothing.
 * - `comment`: a comment on the case by its student or a reviewer; moves nothing.
 * - `reopen`: an attending returns a signed-off case to work (the final approval is superseded).
 * - `discard`: a `case.discarded` stands (a case opened by mistake, with no filled canal).
 * - `restore`: the discard no longer stands (its `case.discarded` was voided).
 */
export const CASE_ACTIONS = [
  'record',
  'attach',
  'submit',
  'withdraw',
  'withdrawReviewed',
  'return',
  'approve',
  'checkpoint',
  'comment',
  'reopen',
  'discard',
  'restore',
] as const;
export type CaseAction = (typeof CASE_ACTIONS)[number];

/** Why an action is refused in a state, in words a student can act on. */
export interface Refusal {
  refused: string;
}

const SIGNED_OFF: Refusal = {
  refused: 'this case is signed off; ask your attending to reopen it before recording more',
};
const DISCARDED: Refusal = { refused: 'this case was discarded; nothing more can be recorded in it' };
const NOT_SUBMITTED: Refusal = { refused: 'this case is not waiting for review' };
const ALREADY_SUBMITTED: Refusal = { refused: 'this case is already waiting for review' };
const NOTHING_TO_WITHDRAW: Refusal = { refused: 'this case has no submission waiting for review to withdraw' };
const DISCARD_SUBMITTED: Refusal = {
  refused: 'this case is waiting for review; withdraw the submission before discarding it',
};
const DISCARD_REVIEWED: Refusal = {
  refused: 'this case has been reviewed and is kept on the record; ask your attending if it was opened by mistake',
};
const NOT_DISCARDED: Refusal = { refused: 'this case is not discarded' };
const WAITING: Refusal = {
  refused:
    'this case is waiting for review, so it takes no new steps; withdraw the submission to go on recording (possible until your attending starts the review), or wait for your attending to return it',
};
const REVIEW_STARTED: Refusal = {
  refused:
    'your attending has already started reviewing this submission, so it can no longer be withdrawn; ask your attending to return the case if it needs more work',
};
const LOCKED_CHECKPOINT: Refusal = { refused: 'this case is signed off; reopen it before signing off a checkpoint' };
const NOT_SIGNED_OFF: Refusal = { refused: 'this case is not signed off, so there is nothing to reopen' };

/** The transition table: for each state and action, the next state or why not. */
export const TRANSITIONS: Readonly<Record<CaseState, Readonly<Record<CaseAction, CaseState | Refusal>>>> = {
  open: {
    record: 'open',
    attach: 'open',
    submit: 'submitted',
    withdraw: NOTHING_TO_WITHDRAW,
    withdrawReviewed: NOTHING_TO_WITHDRAW,
    return: NOT_SUBMITTED,
    approve: NOT_SUBMITTED,
    checkpoint: 'open',
    comment: 'open',
    reopen: NOT_SIGNED_OFF,
    discard: 'discarded',
    restore: NOT_DISCARDED,
  },
  // Waiting for review: the student's steps wait too. What it takes: the withdrawal of the
  // submission until the attending acts on it, what attaches to a radiograph recorded before
  // it, and the attending's checkpoints, comments and final review.
  submitted: {
    record: WAITING,
    attach: 'submitted',
    submit: ALREADY_SUBMITTED,
    withdraw: 'open',
    withdrawReviewed: REVIEW_STARTED,
    return: 'returned',
    approve: 'approved',
    checkpoint: 'submitted',
    comment: 'submitted',
    reopen: NOT_SIGNED_OFF,
    discard: DISCARD_SUBMITTED,
    restore: NOT_DISCARDED,
  },
  // A returned case is worked on again and submitted again; withdrawing a later submission
  // is not possible from here (the case is no longer waiting).
  returned: {
    record: 'returned',
    attach: 'returned',
    submit: 'submitted',
    withdraw: NOTHING_TO_WITHDRAW,
    withdrawReviewed: NOTHING_TO_WITHDRAW,
    return: NOT_SUBMITTED,
    approve: NOT_SUBMITTED,
    checkpoint: 'returned',
    comment: 'returned',
    reopen: NOT_SIGNED_OFF,
    discard: DISCARD_REVIEWED,
    restore: NOT_DISCARDED,
  },
  // Locked: only a reopening (by an attending) brings it back to work; comments stay possible.
  approved: {
    record: SIGNED_OFF,
    attach: SIGNED_OFF,
    submit: SIGNED_OFF,
    withdraw: SIGNED_OFF,
    withdrawReviewed: SIGNED_OFF,
    return: NOT_SUBMITTED,
    approve: NOT_SUBMITTED,
    checkpoint: LOCKED_CHECKPOINT,
    comment: 'approved',
    reopen: 'open',
    discard: SIGNED_OFF,
    restore: NOT_DISCARDED,
  },
  // Voiding the discard is the one event a discarded case takes; it returns the case to open.
  discarded: {
    record: DISCARDED,
    attach: DISCARDED,
    submit: DISCARDED,
    withdraw: DISCARDED,
    withdrawReviewed: DISCARDED,
    return: DISCARDED,
    approve: DISCARDED,
    checkpoint: DISCARDED,
    comment: DISCARDED,
    reopen: DISCARDED,
    discard: DISCARDED,
    restore: 'open',
  },
};

/**
 * The state a case moves to when `action` happens in `state`, or why it may not.
 * @example next('open', 'submit') // 'submitted'
 */
export function next(state: CaseState, action: CaseAction): CaseState | Refusal {
  return TRANSITIONS[state][action];
}

export function isRefusal(x: CaseState | Refusal): x is Refusal {
  return typeof x === 'object';
}

export function isCaseState(x: unknown): x is CaseState {
  return typeof x === 'string' && (CASE_STATES as readonly string[]).includes(x);
}

/** Plain words for each state, as the pages and the tablet show them. */
export const CASE_STATE_LABELS: Readonly<Record<CaseState, string>> = {
  open: 'In progress',
  submitted: 'Waiting for review',
  returned: 'Returned',
  approved: 'Signed off',
  discarded: 'Discarded',
};

/** States that replace the rules' own status on every canal of the case when shown. */
export const REVIEW_STATES_SHOWN_ON_CANALS: readonly CaseState[] = ['approved', 'returned'];

/** A locked case keeps its canals' verdicts: rules and settings changes do not re-judge them. */
export function isLocked(state: CaseState): boolean {
  return state === 'approved';
}

/** What a final approval must not leave behind: counted over the case's live canals. */
export interface ApprovalBlockers {
  /** Open stop findings. */
  stops: number;
  /** Names of canals with no seated master cone. */
  unfilled: readonly string[];
}

/**
 * Why a final approval may not be given although the lifecycle allows `approve`, or null.
 * @example finalApprovalRefusal({ stops: 0, unfilled: ['MB'] }) // { refused: 'canal MB is unfilled; …' }
 */
export function finalApprovalRefusal(b: ApprovalBlockers): Refusal | null {
  const why: string[] = [];
  if (b.stops > 0) why.push(`${b.stops} open stop${b.stops === 1 ? '' : 's'}`);
  if (b.unfilled.length > 0)
    why.push(`${b.unfilled.length === 1 ? 'canal' : 'canals'} ${b.unfilled.join(', ')} unfilled`);
  if (why.length === 0) return null;
  return {
    refused: `this case cannot be signed off with ${why.join(' and ')}; return it to the student with what to put right`,
  };
}
