// The case lifecycle: the states a case is in and the actions that move it, as one table.
// The server decides every change of a case's status through next(); the pages show the
// labels below. A new transition is a new row here, never a check written elsewhere.

export const CASE_STATES = ['open', 'submitted', 'returned', 'approved', 'discarded'] as const;
export type CaseState = (typeof CASE_STATES)[number];

/**
 * What can happen to a case:
 * - `record`: a new event of the student's (a step, a note, a withdrawal); moves nothing.
 * - `submit`: a `case.submitted` stands.
 * - `withdraw`: the submission no longer stands (its `case.submitted` was voided).
 * - `return`, `approve`: an attending's final review.
 * - `discard`: a `case.discarded` stands (a case opened by mistake, with no filled canal).
 * - `restore`: the discard no longer stands (its `case.discarded` was voided).
 */
export const CASE_ACTIONS = ['record', 'submit', 'withdraw', 'return', 'approve', 'discard', 'restore'] as const;
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

/** The transition table: for each state and action, the next state or why not. */
export const TRANSITIONS: Readonly<Record<CaseState, Readonly<Record<CaseAction, CaseState | Refusal>>>> = {
  open: {
    record: 'open',
    submit: 'submitted',
    withdraw: NOTHING_TO_WITHDRAW,
    return: NOT_SUBMITTED,
    approve: NOT_SUBMITTED,
    discard: 'discarded',
    restore: NOT_DISCARDED,
  },
  submitted: {
    record: 'submitted',
    submit: ALREADY_SUBMITTED,
    withdraw: 'open',
    return: 'returned',
    approve: 'approved',
    discard: DISCARD_SUBMITTED,
    restore: NOT_DISCARDED,
  },
  // A returned case is worked on again and submitted again; withdrawing a later submission
  // is not possible from here (the case is no longer waiting).
  returned: {
    record: 'returned',
    submit: 'submitted',
    withdraw: NOTHING_TO_WITHDRAW,
    return: NOT_SUBMITTED,
    approve: NOT_SUBMITTED,
    discard: DISCARD_REVIEWED,
    restore: NOT_DISCARDED,
  },
  approved: {
    record: SIGNED_OFF,
    submit: SIGNED_OFF,
    withdraw: SIGNED_OFF,
    return: NOT_SUBMITTED,
    approve: NOT_SUBMITTED,
    discard: SIGNED_OFF,
    restore: NOT_DISCARDED,
  },
  // Voiding the discard is the one event a discarded case takes; it returns the case to open.
  discarded: {
    record: DISCARDED,
    submit: DISCARDED,
    withdraw: DISCARDED,
    return: DISCARDED,
    approve: DISCARDED,
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
