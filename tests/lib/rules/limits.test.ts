import { describe, expect, it } from 'vitest';
import { CaseTally, LIMITS, LIMIT_MESSAGES, tallyOf, type TallyEvent } from '../../../src/lib/rules/index';

let n = 0;
const id = () => `e${++n}`;
const added = (canalId: string): TallyEvent => ({ id: id(), type: 'canal.added', canalId });
const step = (canalId: string | null): TallyEvent => ({ id: id(), type: 'spreader.placed', canalId });
const voids = (target: TallyEvent): TallyEvent => ({
  id: id(),
  type: 'event.voided',
  canalId: target.canalId ?? null,
  eventId: target.id,
});

/** A tally holding `count` canals set up, and their canal.added events. */
function withCanals(count: number): { tally: CaseTally; setUps: TallyEvent[] } {
  const tally = new CaseTally();
  const setUps = Array.from({ length: count }, (_, i) => added(`canal-${i}`));
  for (const e of setUps) tally.add(e);
  return { tally, setUps };
}

describe('CaseTally.breach', () => {
  it(`takes canals up to ${LIMITS.canalsPerCase} and refuses one more, saying what to do`, () => {
    const { tally } = withCanals(LIMITS.canalsPerCase - 1);
    const last = added('last');
    expect(tally.breach(last)).toBeNull();
    tally.add(last);
    expect(tally.breach(added('one-too-many'))).toEqual({
      limit: 'canalsPerCase',
      error: LIMIT_MESSAGES.canalsPerCase,
    });
    expect(LIMIT_MESSAGES.canalsPerCase).toMatch(/8 canals.*withdraw/);
  });

  it("frees a canal's place when its set-up is withdrawn, and takes it back when that withdrawal is withdrawn", () => {
    const { tally, setUps } = withCanals(LIMITS.canalsPerCase);
    const undo = voids(setUps[2]!);
    expect(tally.breach(undo)).toBeNull();
    tally.add(undo);
    expect(tally.liveCanals().size).toBe(LIMITS.canalsPerCase - 1);
    const replacement = added('replacement');
    expect(tally.breach(replacement)).toBeNull();
    tally.add(replacement);
    // Bringing the withdrawn canal back would make nine.
    expect(tally.breach(voids(undo))?.limit).toBe('canalsPerCase');
  });

  it(`counts every event naming a canal, withdrawals included, up to ${LIMITS.eventsPerCanal}`, () => {
    const { tally, setUps } = withCanals(1);
    const events = [setUps[0]!];
    while (events.length < LIMITS.eventsPerCanal) {
      const e = events.length % 2 === 0 ? voids(events.at(-1)!) : step('canal-0');
      expect(tally.breach(e)).toBeNull();
      tally.add(e);
      events.push(e);
    }
    expect(tally.breach(step('canal-0'))).toEqual({ limit: 'eventsPerCanal', error: LIMIT_MESSAGES.eventsPerCanal });
    expect(tally.breach(voids(events[1]!))?.limit).toBe('eventsPerCanal');
    expect(tally.breach(step('another-canal'))).toBeNull();
  });

  it(`takes ${LIMITS.caseLevelEventsPerCase} case-level events and refuses one more`, () => {
    const tally = new CaseTally();
    tally.addCount(null, LIMITS.caseLevelEventsPerCase - 1);
    expect(tally.breach(step(null))).toBeNull();
    tally.add(step(null));
    expect(tally.breach(step(null))).toEqual({
      limit: 'caseLevelEventsPerCase',
      error: LIMIT_MESSAGES.caseLevelEventsPerCase,
    });
    expect(tally.breach(step('canal-0'))).toBeNull();
  });
});

describe('tallyOf', () => {
  it("reads a case's events as the tablet keeps them, withdrawn set-ups freeing their place", () => {
    const wire = (e: TallyEvent) => ({
      id: e.id,
      type: e.type,
      ...(e.canalId ? { canalId: e.canalId } : {}),
      data: e.eventId ? { eventId: e.eventId, reason: '' } : {},
    });
    const setUps = Array.from({ length: LIMITS.canalsPerCase }, (_, i) => added(`c${i}`));
    const undo = voids(setUps[0]!);
    expect(tallyOf(setUps.map(wire)).breach(added('x'))?.limit).toBe('canalsPerCase');
    expect(tallyOf([...setUps, undo].map(wire)).breach(added('x'))).toBeNull();
    expect(tallyOf([...setUps, undo].map(wire)).liveCanals()).not.toContain('c0');
  });
});
