// parseEvent is plain code (the browser loads it without zod); eventSchema routes the event with
// zod and reads it with the same field definitions. These properties pin that both give the
// same answer to any input: accept or refuse alike, the same event, the same sentence.
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { EVENT_TYPES, eventSchema, formatZodError, parseEvent, type LogEvent } from '../../../src/lib/rules';
import { ISO_INSTANT } from '../../../src/lib/rules/fields';
import { parsedType } from '../../../src/lib/rules/record';
import { messyCase, SEED, textbookCanal } from './arbitraries';
import { NOW, uuidFor } from './builder';

// eventSchema checks `at` against this device's clock: fix it, so that both read the same clock.
beforeAll(() => {
  vi.useFakeTimers({ toFake: ['Date'] });
  vi.setSystemTime(NOW);
});
afterAll(() => {
  vi.useRealTimers();
});

interface Answer {
  ok: boolean;
  event?: LogEvent;
  error?: string;
}

/** Both answers for one input, in the same terms. */
function bothAnswers(x: unknown): { plain: Answer; zod: Answer } {
  const p = parseEvent(x);
  const r = eventSchema.safeParse(x);
  return {
    plain: p.ok ? { ok: true, event: p.event } : { ok: false, error: p.error },
    zod: r.success ? { ok: true, event: r.data } : { ok: false, error: formatZodError(r.error) },
  };
}

/** Keys of the event and of its data, in order (the canonical form and the outbox keep them). */
const keysOf = (e: LogEvent | undefined) => e && [Object.keys(e), Object.keys(e.data)];

function expectAgreement(x: unknown): void {
  const { plain, zod } = bothAnswers(x);
  expect(zod).toStrictEqual(plain);
  expect(keysOf(zod.event)).toEqual(keysOf(plain.event));
}

const REMOVE = Symbol('remove the field');
/** Values close to what a field takes, and values far from it. */
const oddValue = fc.oneof(
  fc.constantFrom<unknown>(
    REMOVE,
    undefined,
    null,
    '',
    ' ',
    0,
    -0,
    0.25,
    0.5,
    13.25,
    13.5,
    20.5,
    40,
    40.5,
    -5,
    -5.5,
    6,
    35,
    65,
    150,
    '6',
    '06',
    '35',
    'MF',
    'mf',
    'XXL',
    ' MB ',
    'x'.repeat(2001),
    true,
    'false',
    46,
    55,
    56,
    99,
    'step-back',
    0.04,
    '0.04',
    '0.13',
    ['naocl', 'naocl'],
    [],
    ['bleach'],
    {},
    [1],
    'post-op',
    'maf',
    'patient',
    'block',
    'extracted',
    'DEMO-7',
    uuidFor(9).toUpperCase(),
    'not-a-uuid',
    '2026-12-02T09:41:07+0100',
    '2026-02-29T09:00:00Z',
    '2026-12-02T09:41:07',
    '2026-12-04T09:00:00.001Z',
    '2026-12-04T10:00:00.000+01:00',
    new Date(0),
    new Map(),
    'foo.bar',
    7,
    ...EVENT_TYPES,
  ),
  fc.jsonValue(),
);

/** A valid event with some of its fields (envelope or data) replaced, removed or added. */
const mutatedEvent = fc
  .oneof(
    textbookCanal.map((t) => t.events),
    messyCase(true).map((m) => m.events),
  )
  .chain((events) => fc.constantFrom(...events))
  .chain((e) => {
    const paths = [
      ...Object.keys(e),
      'canalId',
      ...Object.keys(e.data).map((k) => `data.${k}`),
      'data.tooth',
      'data.chartRef',
      'data.extra',
    ];
    return fc.array(fc.tuple(fc.constantFrom(...paths), oddValue), { minLength: 1, maxLength: 3 }).map((changes) => {
      const out: Record<string, unknown> = { ...e, data: { ...e.data } };
      for (const [path, v] of changes) {
        const [head, key] = path.split('.') as [string, string | undefined];
        const target = key === undefined ? out : out.data;
        if (
          target === null ||
          typeof target !== 'object' ||
          Array.isArray(target) ||
          target instanceof Date ||
          target instanceof Map
        )
          continue;
        const field = key ?? head;
        if (v === REMOVE) delete (target as Record<string, unknown>)[field];
        else (target as Record<string, unknown>)[field] = v;
      }
      return out;
    });
  });

/** Any JSON, and JSON objects with the keys of an event. */
const anyJson = fc.oneof(
  fc.jsonValue(),
  fc.record(
    {
      id: fc.jsonValue(),
      caseId: fc.jsonValue(),
      canalId: fc.jsonValue(),
      type: fc.oneof(fc.constantFrom(...EVENT_TYPES), fc.jsonValue()),
      at: fc.jsonValue(),
      data: fc.jsonValue(),
    },
    { requiredKeys: [] },
  ),
);

describe('parseEvent and eventSchema', () => {
  it('agree on valid events changed field by field', () => {
    let accepted = 0;
    fc.assert(
      fc.property(mutatedEvent, (x) => {
        expectAgreement(x);
        if (parseEvent(x).ok) accepted += 1;
      }),
      { seed: SEED, numRuns: 1000 },
    );
    // Some changes keep an event valid (a size written as a number, an extra key): both paths are exercised.
    expect(accepted).toBeGreaterThan(20);
    expect(accepted).toBeLessThan(900);
  });

  it('agree on any JSON', () => {
    fc.assert(fc.property(anyJson, expectAgreement), { seed: SEED, numRuns: 1000 });
  });

  it('agree on the edges the unit tests name', () => {
    const ev = {
      id: uuidFor(1),
      caseId: uuidFor(2),
      canalId: uuidFor(3),
      type: 'spreader.placed',
      at: '2026-12-02T09:41:07.250Z',
      data: { spreader: 'MF', depthMm: 13.5 },
    };
    for (const x of [
      ev,
      { ...ev, type: undefined },
      { ...ev, type: null },
      { ...ev, type: 'foo.bar' },
      { ...ev, type: 7 },
      [],
      null,
      'x',
      new Date(0),
      { ...ev, data: 7 },
      { ...ev, data: undefined },
      { ...ev, type: 'gp.compacted', data: null },
      { ...ev, at: '2026-12-04T09:00:00.001Z' },
      { ...ev, id: 'x', at: 'y', data: { depthMm: 0.2 } },
      { ...ev, type: 'case.opened', canalId: undefined, data: { setting: 'patient', tooth: 99 } },
    ])
      expectAgreement(x);
  });
});

describe('the plain reader’s copies of zod', () => {
  it('the instant pattern is the one zod builds for datetime({ offset: true })', () => {
    const zods = z.datetimeRegex({ precision: null, offset: true, local: false });
    expect([ISO_INSTANT.source, ISO_INSTANT.flags]).toEqual([zods.source, zods.flags]);
  });
  it('parsedType names any value as z.getParsedType does', () => {
    const anything = fc.anything({
      withNullPrototype: true,
      withBigInt: true,
      withDate: true,
      withMap: true,
      withSet: true,
      withTypedArray: true,
      withSparseArray: true,
    });
    fc.assert(
      fc.property(anything, (x) => {
        expect(parsedType(x)).toBe(z.getParsedType(x));
      }),
      { seed: SEED, numRuns: 500 },
    );
    for (const x of [Promise.resolve(1), { then: () => 1, catch: () => 1 }, () => 1, Symbol('s'), Number.NaN, 1n])
      expect(parsedType(x)).toBe(z.getParsedType(x));
  });
});
