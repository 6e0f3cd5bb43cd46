// Properties of the rules core, checked with fast-check on a fixed seed (printed on failure).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  averageLengthMm,
  canalThirds,
  diameterAtMm,
  evaluateCanal,
  fdiToUniversal,
  isConeSize,
  isoColour,
  isValidFdi,
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

  it('parseEvent answers near-valid events with a sentence, or an event it accepts again within range', () => {
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
          const r = parseEvent(
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
          if (!r.ok) {
            // An error is one sentence a person can act on, naming what is wrong.
            expect(r.error).toMatch(/^\S.*\S$/);
            return;
          }
          // What it accepts it accepts again unchanged, and within the contract's ranges.
          expect(parseEvent(r.event, NOW)).toEqual(r);
          if (r.event.type === 'spreader.placed') {
            expect(isConeSize(r.event.data.spreader)).toBe(true);
            expect(r.event.data.depthMm).toBeGreaterThanOrEqual(0.5);
            expect(r.event.data.depthMm).toBeLessThanOrEqual(40);
            expect(r.event.data.depthMm % 0.5).toBe(0);
          }
          if (r.event.type === 'case.opened' && r.event.data.tooth !== undefined) {
            expect(isValidFdi(r.event.data.tooth)).toBe(true);
          }
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

  it('the calculators never throw and the tables answer a value of their kind, or none, for any input', () => {
    fc.assert(
      fc.property(fc.double(), fc.double(), fc.double(), fc.string(), fc.anything(), (a, b, c, s, x) => {
        canalThirds(a, b, c);
        canalThirds(a, undefined, c);
        diameterAtMm(s, a, b);
        workingLengthByDiscrepancy(a, b);
        workingLengthFromApexLocator(a, b);
        proportionalLength(a, b, c);
        stepBackSchedule(s, a, 1.0, Math.floor(b));
        // The lookups answer a value of their kind, or "none", for anything at all.
        const size = normaliseSize(x);
        expect(size === null || isConeSize(size)).toBe(true);
        const colour = isoColour(s);
        expect(colour === null || /^#[0-9a-f]{6}$/i.test(colour.hex)).toBe(true);
        for (const u of [universalToFdi(s), universalToFdi(a)]) expect(u === null || isValidFdi(u)).toBe(true);
        const avg = averageLengthMm(a);
        expect(avg === null || (Number.isFinite(avg) && avg > 0)).toBe(true);
        expect(typeof fdiToUniversal(a)).toBe('string');
        expect(typeof toothName(a)).toBe('string');
        const usual = usualCanals(a);
        expect([...usual.canals, ...usual.optional].every((n) => typeof n === 'string' && n.length > 0)).toBe(true);
        expect(referencePointsFor(a).every((p) => typeof p === 'string' && p.length > 0)).toBe(true);
      }),
      RUNS,
    );
  });
});
