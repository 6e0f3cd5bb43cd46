import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { caseTimeline, evaluateCanal, type LogEvent } from '../../../src/lib/rules/core';
import { CanalMemo, casesOnTablet, deriveCase } from '../../../src/lib/client/derive';
import type { StoredEvent } from '../../../src/lib/client/outbox';
import { messyCase, SEED, textbookCanal } from '../rules/arbitraries';

const rowsOf = (events: LogEvent[]): StoredEvent[] =>
  events.map((event, seq) => ({ kind: 'event', userId: 1, event, seq, state: 'synced' }));

/** The tablet's view of each canal must be the rules core's, field for field. */
function expectSameAsRulesCore(events: LogEvent[], canalIds: string[]) {
  const caseId = events[0]!.caseId;
  const tablet = deriveCase(rowsOf(events), caseId, new CanalMemo());
  const expected = canalIds.filter((id) => evaluateCanal(id, events) !== null);
  expect(tablet.canals.map((c) => c.canalId).sort()).toEqual(expected.sort());
  for (const c of tablet.canals) {
    const core = evaluateCanal(c.canalId, events)!;
    expect(c.reading.result).toEqual(core);
    expect(c.cwlMm).toBe(core.state.cwlMm);
    expect(c.name).toBe(core.state.name);
  }
  expect(tablet.caseLevel).toEqual(caseTimeline(caseId, events));
}

describe('deriveCase', () => {
  it('shows each generated canal exactly as the rules core reads it, voids and all (seed printed on failure)', () => {
    fc.assert(
      fc.property(messyCase(false), ({ canalIds, events }) => expectSameAsRulesCore(events, canalIds)),
      { seed: SEED, numRuns: 150 },
    );
    fc.assert(
      fc.property(messyCase(true), ({ canalIds, events }) => expectSameAsRulesCore(events, canalIds)),
      { seed: SEED, numRuns: 150 },
    );
    fc.assert(
      fc.property(textbookCanal, ({ canalId, events }) => expectSameAsRulesCore(events, [canalId])),
      { seed: SEED, numRuns: 100 },
    );
  });

  it('reads a canal again only when its own events or the case-level ones change', () => {
    const sample = fc.sample(messyCase(false), { seed: SEED, numRuns: 1 })[0]!;
    const [a, b] = sample.canalIds as [string, string];
    const memo = new CanalMemo();
    const rows = rowsOf(sample.events);
    const caseId = sample.events[0]!.caseId;
    deriveCase(rows, caseId, memo);
    expect(memo.evaluations).toBe(2);
    deriveCase([...rows], caseId, memo);
    expect(memo.evaluations).toBe(2);
    const note = (canalId?: string): LogEvent =>
      ({
        id: `note-${canalId ?? 'case'}`,
        caseId,
        ...(canalId ? { canalId } : {}),
        type: 'note.added',
        at: '2026-12-02T12:00:00.000Z',
        data: { text: 'n' },
      }) as LogEvent;
    const withA = [...rows, ...rowsOf([note(a)])];
    const tablet = deriveCase(withA, caseId, memo);
    expect(memo.evaluations).toBe(3);
    expect(tablet.canals.find((c) => c.canalId === b)?.reading.result).toEqual(evaluateCanal(b, sample.events));
    deriveCase([...withA, ...rowsOf([note()])], caseId, memo);
    expect(memo.evaluations).toBe(5);
  });
});

describe('casesOnTablet', () => {
  it('lists a case whose opening stands and drops one whose opening was withdrawn', () => {
    const opened = (id: string, caseId: string, at: string): LogEvent =>
      ({ id, caseId, type: 'case.opened', at, data: { setting: 'block' } }) as LogEvent;
    const events: LogEvent[] = [
      opened('o1', 'case-a', '2026-12-02T09:00:00.000Z'),
      opened('o2', 'case-b', '2026-12-02T10:00:00.000Z'),
      {
        id: 'v1',
        caseId: 'case-a',
        type: 'event.voided',
        at: '2026-12-02T09:01:00.000Z',
        data: { eventId: 'o1', reason: 'wrong' },
      } as LogEvent,
    ];
    expect(casesOnTablet(rowsOf(events)).map((c) => c.caseId)).toEqual(['case-b']);
  });
});
