// Properties of the rules core, checked with fast-check on a fixed seed (printed on failure).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  averageLengthMm,
  canalThirds,
  diameterAtMm,
  evaluateCanal,
  fdiToUniversal,
  isoColour,
  normaliseSize,
  parseEvent,
  proportionalLength,
  referencePointsFor,
  stepBackSchedule,
  toothName,
  universalToFdi,
  usualCanals,
  workingLengthByDiscrepancy,
  workingLengthFromApexLocator,
  type LogEvent,
} from '../../../src/lib/rules';
import { messyCase, SEED, textbookCanal } from './arbitraries';
import { mustParse, NOW, uuidFor } from './builder';

const RUNS = { seed: SEED, numRuns: 300 };

/** A permutation of `xs` drawn by fast-check. */
const withShuffle = <T>(arb: fc.Arbitrary<T & { events: LogEvent[] }>) =>
  arb.chain((c) =>
    fc
      .shuffledSubarray(c.events, { minLength: c.events.length, maxLength: c.events.length })
      .map((shuffled) => ({ c, shuffled })),
  );

describe('the generators', () => {
  it('make only events that parseEvent accepts unchanged', () => {
    const arb = fc.oneof(
      textbookCanal.map((t) => t.events),
      messyCase(true).map((m) => m.events),
    );
    fc.assert(
      fc.property(arb, (events) => {
        for (const e of events) expect(parseEvent(e, NOW)).toEqual({ ok: true, event: e });
      }),
      { seed: SEED, numRuns: 60 },
    );
  });
});

describe('evaluateCanal properties', () => {
  it('gives the same result whatever order the events arrive in (textbook canals)', () => {
    fc.assert(
      fc.property(withShuffle(textbookCanal), ({ c, shuffled }) => {
        expect(evaluateCanal(c.canalId, shuffled)).toEqual(evaluateCanal(c.canalId, c.events));
      }),
      RUNS,
    );
  });

  it('gives the same result whatever order the events arrive in (messy cases with shared instants)', () => {
    fc.assert(
      fc.property(withShuffle(messyCase(true)), ({ c, shuffled }) => {
        for (const canalId of c.canalIds)
          expect(evaluateCanal(canalId, shuffled)).toEqual(evaluateCanal(canalId, c.events));
      }),
      RUNS,
    );
  });

  it('changes nothing when an event is voided and an identical one added with a new id', () => {
    const arb = fc
      .oneof(
        textbookCanal.map((t) => ({ canalIds: [t.canalId], events: t.events })),
        messyCase(false),
      )
      .chain((c) => fc.nat(c.events.length - 1).map((k) => ({ c, k })));
    fc.assert(
      fc.property(arb, ({ c, k }) => {
        const target = c.events[k] as LogEvent;
        const named = new Set(
          c.events.flatMap((e) =>
            e.type === 'accessory.removed' || e.type === 'event.voided' ? [e.data.eventId] : [],
          ),
        );
        fc.pre(!named.has(target.id) && target.type !== 'event.voided');
        const newId = uuidFor(0xfffffff0);
        const voidAt = new Date(Date.parse(target.at) + 1).toISOString();
        const voidEvent = mustParse({
          id: uuidFor(0xfffffff1),
          caseId: target.caseId,
          canalId: target.canalId,
          type: 'event.voided',
          at: voidAt,
          data: { eventId: target.id, reason: 'retyped' },
        });
        const copy = { ...target, id: newId } as LogEvent;
        for (const canalId of c.canalIds) {
          const before = evaluateCanal(canalId, c.events);
          const after = evaluateCanal(canalId, [...c.events, voidEvent, copy]);
          expect(JSON.parse(JSON.stringify(after).split(newId).join(target.id))).toEqual(
            JSON.parse(JSON.stringify(before)),
          );
        }
      }),
      RUNS,
    );
  });

  it('raises no stop or caution on a textbook canal', () => {
    fc.assert(
      fc.property(textbookCanal, (c) => {
        const r = evaluateCanal(c.canalId, c.events);
        expect(r?.findings.filter((f) => f.severity !== 'note')).toEqual([]);
        expect(r?.state.complete).toBe(true);
      }),
      RUNS,
    );
  });

  it('raises accessory-short for a short accessory cone until it is removed', () => {
    const arb = textbookCanal.chain((c) => {
      const spreaders = c.events.filter((e) => e.type === 'spreader.placed');
      return fc.constantFrom(...spreaders).map((sp) => ({ c, sp }));
    });
    fc.assert(
      fc.property(arb, ({ c, sp }) => {
        if (sp.type !== 'spreader.placed') return;
        const at = (ms: number) => new Date(Date.parse(sp.at) + ms).toISOString();
        const short = mustParse({
          id: uuidFor(0xfffffff2),
          caseId: sp.caseId,
          canalId: sp.canalId,
          type: 'accessory.placed',
          at: at(1),
          data: { size: sp.data.spreader, lengthMm: sp.data.depthMm, reachedLength: false },
        });
        const flagged = evaluateCanal(c.canalId, [...c.events, short]);
        expect(flagged?.findings.filter((f) => f.code === 'accessory-short').map((f) => f.eventId)).toEqual([short.id]);
        const removal = mustParse({
          id: uuidFor(0xfffffff3),
          caseId: sp.caseId,
          canalId: sp.canalId,
          type: 'accessory.removed',
          at: at(2),
          data: { eventId: short.id, reason: 'stopped short' },
        });
        const cleared = evaluateCanal(c.canalId, [...c.events, short, removal]);
        expect(cleared?.findings.filter((f) => f.code === 'accessory-short')).toEqual([]);
        expect(cleared?.state.conesWithdrawn).toBe((flagged?.state.conesWithdrawn ?? -1) + 1);
      }),
      RUNS,
    );
  });
});

describe('no input makes the module throw', () => {
  it('parseEvent answers anything with ok or an error sentence', () => {
    fc.assert(
      fc.property(
        fc.anything({
          withNullPrototype: true,
          withBigInt: true,
          withDate: true,
          withMap: true,
          withSet: true,
          withTypedArray: true,
          withSparseArray: true,
        }),
        (raw) => {
          const r = parseEvent(raw, NOW);
          if (!r.ok) expect(r.error.length).toBeGreaterThan(0);
        },
      ),
      RUNS,
    );
  });

  it('parseEvent answers near-valid events with errors, never exceptions', () => {
    const field = fc.oneof(
      fc.anything(),
      fc.double(),
      fc.string(),
      fc.constantFrom('MF', '35', 35, 13.5, -1, 41, null),
    );
    fc.assert(
      fc.property(
        fc.record({
          type: fc.constantFrom('spreader.placed', 'case.opened', 'canal.added', 'gp.seared', 'radiograph.taken'),
          a: field,
          b: field,
          c: field,
        }),
        (g) => {
          parseEvent(
            {
              id: uuidFor(1),
              caseId: uuidFor(2),
              canalId: uuidFor(3),
              type: g.type,
              at: '2026-12-02T09:00:00Z',
              data: {
                spreader: g.a,
                depthMm: g.b,
                setting: g.c,
                tooth: g.a,
                cwlMm: g.b,
                atOrifice: g.c,
                relativeToCejMm: g.a,
                purpose: g.b,
              },
            },
            NOW,
          );
        },
      ),
      RUNS,
    );
  });

  it('evaluateCanal answers any mix of valid events and junk', () => {
    fc.assert(
      fc.property(messyCase(true), fc.array(fc.anything(), { maxLength: 5 }), (c, junk) => {
        for (const canalId of c.canalIds) {
          const r = evaluateCanal(canalId, [...c.events, ...(junk as LogEvent[])], {
            minAccessoryCones: -1,
            fallbackStopDepthMm: Number.POSITIVE_INFINITY,
          });
          // The set-up events are never voided in these cases, so a null here would be an error swallowed.
          expect(r).not.toBeNull();
          expect(r?.findings.every((f) => f.message.length > 0)).toBe(true);
        }
      }),
      RUNS,
    );
  });

  it('the tables and calculators answer any number or string', () => {
    fc.assert(
      fc.property(fc.double(), fc.double(), fc.double(), fc.string(), fc.anything(), (a, b, c, s, x) => {
        canalThirds(a, b, c);
        canalThirds(a, undefined, c);
        normaliseSize(x);
        isoColour(s);
        diameterAtMm(s, a, b);
        universalToFdi(s);
        universalToFdi(a);
        averageLengthMm(a);
        fdiToUniversal(a);
        toothName(a);
        usualCanals(a);
        referencePointsFor(a);
        workingLengthByDiscrepancy(a, b);
        workingLengthFromApexLocator(a, b);
        proportionalLength(a, b, c);
        stepBackSchedule(s, a, 1.0, Math.floor(b));
      }),
      RUNS,
    );
  });
});
