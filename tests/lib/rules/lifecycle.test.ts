// The case lifecycle (docs/lifecycle.md): every allowed transition and every refused one.
import { describe, expect, it } from 'vitest';
import {
  CASE_ACTIONS,
  CASE_STATES,
  CASE_STATE_LABELS,
  finalApprovalRefusal,
  isCaseState,
  isLocked,
  isRefusal,
  next,
  type CaseAction,
  type CaseState,
} from '../../../src/lib/rules/index';

// Every (state, action) pair: the state it leads to, or a piece of the refusal's words.
const TABLE: [CaseState, CaseAction, CaseState | RegExp][] = [
  ['open', 'record', 'open'],
  ['open', 'attach', 'open'],
  ['open', 'submit', 'submitted'],
  ['open', 'withdraw', /no submission waiting/],
  ['open', 'withdrawReviewed', /no submission waiting/],
  ['open', 'return', /not waiting for review/],
  ['open', 'approve', /not waiting for review/],
  ['open', 'checkpoint', 'open'],
  ['open', 'comment', 'open'],
  ['open', 'reopen', /not signed off/],
  ['submitted', 'record', /waiting for review, so it takes no new steps; withdraw the submission/],
  ['submitted', 'attach', 'submitted'],
  ['submitted', 'submit', /already waiting/],
  ['submitted', 'withdraw', 'open'],
  ['submitted', 'withdrawReviewed', /already started reviewing .* ask your attending to return/],
  ['submitted', 'return', 'returned'],
  ['submitted', 'approve', 'approved'],
  ['submitted', 'checkpoint', 'submitted'],
  ['submitted', 'comment', 'submitted'],
  ['submitted', 'reopen', /not signed off/],
  ['returned', 'record', 'returned'],
  ['returned', 'attach', 'returned'],
  ['returned', 'submit', 'submitted'],
  ['returned', 'withdraw', /no submission waiting/],
  ['returned', 'withdrawReviewed', /no submission waiting/],
  ['returned', 'return', /not waiting for review/],
  ['returned', 'approve', /not waiting for review/],
  ['returned', 'checkpoint', 'returned'],
  ['returned', 'comment', 'returned'],
  ['returned', 'reopen', /not signed off/],
  ['approved', 'record', /signed off; ask your attending to reopen it/],
  ['approved', 'attach', /signed off/],
  ['approved', 'submit', /signed off/],
  ['approved', 'withdraw', /signed off/],
  ['approved', 'withdrawReviewed', /signed off/],
  ['approved', 'return', /not waiting for review/],
  ['approved', 'approve', /not waiting for review/],
  ['approved', 'checkpoint', /signed off; reopen it/],
  ['approved', 'comment', 'approved'],
  ['approved', 'reopen', 'open'],
  ['discarded', 'record', /discarded/],
  ['discarded', 'attach', /discarded/],
  ['discarded', 'submit', /discarded/],
  ['discarded', 'withdraw', /discarded/],
  ['discarded', 'withdrawReviewed', /discarded/],
  ['discarded', 'return', /discarded/],
  ['discarded', 'approve', /discarded/],
  ['discarded', 'checkpoint', /discarded/],
  ['discarded', 'comment', /discarded/],
  ['discarded', 'reopen', /discarded/],
  ['open', 'discard', 'discarded'],
  ['open', 'restore', /not discarded/],
  ['submitted', 'discard', /withdraw the submission before discarding/],
  ['submitted', 'restore', /not discarded/],
  ['returned', 'discard', /reviewed and is kept on the record/],
  ['returned', 'restore', /not discarded/],
  ['approved', 'discard', /signed off/],
  ['approved', 'restore', /not discarded/],
  ['discarded', 'discard', /discarded/],
  ['discarded', 'restore', 'open'],
];

describe('next', () => {
  it('has a row in this table for every state and action', () => {
    expect(TABLE.map(([s, a]) => `${s}/${a}`).sort()).toEqual(
      CASE_STATES.flatMap((s) => CASE_ACTIONS.map((a) => `${s}/${a}`)).sort(),
    );
  });

  for (const [state, action, expected] of TABLE.filter((r) => typeof r[2] === 'string')) {
    it(`moves a case that is ${state} to ${String(expected)} on ${action}`, () => {
      expect(next(state, action)).toBe(expected);
    });
  }

  for (const [state, action, words] of TABLE.filter((r) => r[2] instanceof RegExp)) {
    it(`refuses ${action} in a case that is ${state}, saying why`, () => {
      const answer = next(state, action);
      expect(isRefusal(answer)).toBe(true);
      expect(isRefusal(answer) && answer.refused).toMatch(words as RegExp);
    });
  }

  it('keeps the words sync has always answered for an event on a signed-off case', () => {
    expect(next('approved', 'record')).toEqual({
      refused: 'this case is signed off; ask your attending to reopen it before recording more',
    });
  });
});

describe('isCaseState, isLocked and the labels', () => {
  it('knows the five states and no others', () => {
    for (const s of CASE_STATES) expect(isCaseState(s)).toBe(true);
    expect(isCaseState('reopened')).toBe(false);
    expect(isCaseState(3)).toBe(false);
  });
  it('locks only an approved case', () => {
    expect(CASE_STATES.filter(isLocked)).toEqual(['approved']);
  });
  it('has plain words for every state', () => {
    for (const s of CASE_STATES) expect(CASE_STATE_LABELS[s].length).toBeGreaterThan(0);
  });
});

describe('finalApprovalRefusal', () => {
  it('lets a case with no open stop and every canal filled be signed off', () => {
    expect(finalApprovalRefusal({ stops: 0, unfilled: [] })).toBeNull();
  });
  it('refuses a final approval with an open stop, counting them', () => {
    expect(finalApprovalRefusal({ stops: 2, unfilled: [] })?.refused).toMatch(/2 open stops; return it/);
  });
  it('refuses a final approval with an unfilled canal, naming it', () => {
    expect(finalApprovalRefusal({ stops: 0, unfilled: ['MB'] })?.refused).toMatch(/canal MB unfilled/);
    expect(finalApprovalRefusal({ stops: 1, unfilled: ['MB', 'DB'] })?.refused).toMatch(
      /1 open stop and canals MB, DB unfilled/,
    );
  });
});
