// How parseEvent reads the edges of an event. The rules core reads all fields of an event in
// one pass of plain code (for speed, and so the browser need not load zod); these pin what
// z.object over one schema per field did.
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { parseEvent } from '../../../src/lib/rules';
import { NOW, uuidFor } from './builder';

const ev = (extra: Record<string, unknown> = {}) => ({
  id: uuidFor(1),
  caseId: uuidFor(2),
  canalId: uuidFor(3),
  type: 'spreader.placed',
  at: '2026-12-02T09:41:07.250Z',
  data: { spreader: 'MF', depthMm: 13.5 },
  ...extra,
});
const opened = (data: unknown) => {
  const e: Record<string, unknown> = ev({ type: 'case.opened', data });
  delete e.canalId;
  return e;
};
const error = (raw: unknown) => {
  const r = parseEvent(raw, NOW);
  return r.ok ? 'accepted' : r.error;
};
const AT_MESSAGE = 'at must be an ISO 8601 instant with a time zone, such as 2026-12-02T09:41:07.250Z';
const FRACTION_MESSAGE =
  'at may have at most 3 digits after the seconds (milliseconds), such as 2026-12-02T09:41:07.250Z';

describe('at', () => {
  // Every form taken before the fraction rule (offsets with or without a colon, no seconds)
  // is still taken: the contract only grows.
  const accepted = [
    '2026-12-02T09:41:07+0100',
    '2026-12-02T09:41:07-23:59',
    '2026-12-02T09:41Z',
    '2024-02-29T09:00:00Z',
    '2026-12-02T09:41:07.1Z',
    '2026-12-02T09:41:07.25+01:00',
    '2026-12-02T09:41:07.250Z',
    '2026-12-02T09:41:07.123-0530',
  ];
  const refused = [
    '2026-12-02T09:41:07+99:99',
    '2026-02-29T09:00:00Z',
    '2026-12-02t09:41:07Z',
    '2026-12-02T24:00:00Z',
    '2026-12-02T09:41:07',
  ];
  it('takes what zod’s datetime({ offset: true }) takes and Date can read, kept as written', () => {
    const zodInstant = z.string().datetime({ offset: true });
    for (const at of [...accepted, ...refused]) {
      const expected = zodInstant.safeParse(at).success && Number.isFinite(Date.parse(at));
      const r = parseEvent(ev({ at }), NOW);
      expect(r.ok ? r.event.at : r.error, at).toBe(expected ? at : AT_MESSAGE);
    }
    expect(accepted.map((at) => error(ev({ at })))).toEqual(accepted.map(() => 'accepted'));
  });
  it('refuses more than 3 digits after the seconds, saying so', () => {
    for (const at of [
      '2026-12-02T09:41:07.1234Z',
      '2026-12-02T09:41:07.123456789Z',
      '2026-12-02T09:41:07.0000+01:00',
    ]) {
      expect(error(ev({ at })), at).toBe(FRACTION_MESSAGE);
    }
  });
});

describe('optional fields', () => {
  it('keep a key sent as null, as undefined, and leave out a key not sent', () => {
    const sentNull = parseEvent(opened({ setting: 'extracted', tooth: 46, chartRef: null }), NOW);
    const notSent = parseEvent(opened({ setting: 'extracted', tooth: 46 }), NOW);
    if (!sentNull.ok || !notSent.ok) throw new Error('rejected');
    expect(Object.keys(sentNull.event.data)).toEqual(['setting', 'tooth', 'chartRef']);
    expect(Object.keys(notSent.event.data)).toEqual(['setting', 'tooth']);
    expect(Object.keys(notSent.event)).toEqual(['id', 'caseId', 'type', 'at', 'data']);
    const note = parseEvent(ev({ type: 'note.added', canalId: undefined, data: { text: 'ok' } }), NOW);
    expect(note.ok && Object.keys(note.event)).toEqual(['id', 'caseId', 'canalId', 'type', 'at', 'data']);
  });
});

describe('objects', () => {
  it('refuses an event or data that zod does not read as an object', () => {
    for (const x of [new Date(0), new Map(), [], Promise.resolve(1), () => 1])
      expect(error(x)).toBe('the event must be an object');
    for (const d of [new Date(0), new Map(), [], null, 'x', Promise.resolve(1)])
      expect(error(ev({ data: d }))).toBe('data must be an object');
    expect(error(ev({ type: 'gp.compacted', data: null }))).toBe('accepted');
    expect(error(ev({ type: 'gp.compacted', data: [] }))).toBe('data must be an object');
  });
  it('reads data without a prototype', () => {
    expect(error(ev({ data: Object.assign(Object.create(null), { spreader: 'MF', depthMm: 13.5 }) }))).toBe('accepted');
  });
});

describe('problems', () => {
  it('are reported in the contract’s order: the envelope, then data, then cross-field checks', () => {
    expect(error(ev({ id: 'x', at: 'y', data: { depthMm: 0.2 } }))).toBe('id must be a UUID');
    expect(error(ev({ at: 'y', data: { depthMm: 0.2 } }))).toBe(AT_MESSAGE);
    // One problem at a time, the first in that order: the tooth before the missing chart number.
    expect(error(opened({ setting: 'patient', tooth: 99 }))).toContain('tooth must be an FDI tooth number');
  });
});
