import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { canonicalEvent, CASE_LEVEL_ONLY, EVENT_TYPES, formatZodError, parseEvent } from '../../../src/lib/rules';
import { NOW, uuidFor } from './builder';

const CASE = uuidFor(0xc1);
const CANAL = uuidFor(0xc2);
const raw = (type: string, data: unknown, extra: Record<string, unknown> = {}) => ({
  id: uuidFor(0xe1),
  caseId: CASE,
  canalId: CANAL,
  type,
  at: '2026-12-02T09:41:07.250Z',
  data,
  ...extra,
});
const error = (r: unknown) => {
  const p = parseEvent(r, NOW);
  return p.ok ? 'accepted' : p.error;
};

describe('EVENT_TYPES', () => {
  it('lists every type of the sync contract', () => {
    expect(EVENT_TYPES).toHaveLength(25);
    expect(new Set(EVENT_TYPES).size).toBe(25);
  });
});

describe('CASE_LEVEL_ONLY', () => {
  it('holds case.opened, case.submitted and case.discarded', () => {
    expect([...CASE_LEVEL_ONLY].sort()).toEqual(['case.discarded', 'case.opened', 'case.submitted']);
  });
});

describe('parseEvent', () => {
  it('accepts the contract’s example and narrows data by type', () => {
    const r = parseEvent(raw('spreader.placed', { spreader: 'MF', depthMm: 13.5 }), NOW);
    expect(r.ok).toBe(true);
    if (r.ok && r.event.type === 'spreader.placed') expect(r.event.data.depthMm).toBe(13.5);
  });
  it('reads a numeric size as a string: 35 → "35", 6 → "06"', () => {
    const r = parseEvent(raw('master.fitted', { size: 35, lengthMm: 21, reachedLength: true }), NOW);
    expect(r.ok && r.event.type === 'master.fitted' && r.event.data.size).toBe('35');
    const s = parseEvent(raw('seat.checked', { fileSize: 6, lengthMm: 21, result: 'seated' }), NOW);
    expect(s.ok && s.event.type === 'seat.checked' && s.event.data.fileSize).toBe('06');
  });
  it('trims free text and refuses text over its limit', () => {
    const r = parseEvent(raw('note.added', { text: '  cone bent at 15 mm  ' }), NOW);
    expect(r.ok && r.event.type === 'note.added' && r.event.data.text).toBe('cone bent at 15 mm');
    expect(error(raw('note.added', { text: 'x'.repeat(2001) }))).toBe('text must be at most 2,000 characters');
    expect(
      error(
        raw('canal.added', {
          name: 'mesiobuccal-2',
          referencePoint: 'MB cusp',
          cwlMm: 21,
          mafSize: '30',
          preparation: 'step-back',
        }),
      ),
    ).toBe('name must be at most 12 characters');
  });
  it('names the field and what is allowed for lengths', () => {
    expect(error(raw('spreader.placed', { spreader: 'MF', depthMm: 13.25 }))).toBe(
      'depthMm must be a multiple of 0.5 mm',
    );
    expect(error(raw('spreader.placed', { spreader: 'MF', depthMm: 40.5 }))).toBe(
      'depthMm must be between 0.5 and 40 mm',
    );
    expect(error(raw('spreader.placed', { spreader: 'MF', depthMm: 0 }))).toBe('depthMm must be between 0.5 and 40 mm');
    expect(error(raw('spreader.placed', { spreader: 'MF', depthMm: '13' }))).toBe(
      'depthMm must be a number of millimetres',
    );
    expect(error(raw('spreader.placed', { spreader: 'MF' }))).toBe('depthMm is required');
  });
  it('keeps the orifice depth in 0–20 mm and the CEJ level in −5 to +5 mm', () => {
    const added = { name: 'MB', referencePoint: 'MB cusp', cwlMm: 21, mafSize: '30', preparation: '0.04' };
    expect(error(raw('canal.added', { ...added, orificeDepthMm: 0 }))).toBe('accepted');
    expect(error(raw('canal.added', { ...added, orificeDepthMm: 20.5 }))).toBe(
      'orificeDepthMm must be between 0 and 20 mm',
    );
    expect(error(raw('gp.seared', { atOrifice: false, relativeToCejMm: -5 }))).toBe('accepted');
    expect(error(raw('gp.seared', { atOrifice: false, relativeToCejMm: -5.5 }))).toBe(
      'relativeToCejMm must be between -5 and 5 mm',
    );
  });
  it('refuses a size that is neither ISO nor a designation', () => {
    const msg =
      'spreader must be an ISO size (06, 08, 10, 15–60 by 5, 70–140 by 10) or one of XF, FF, MF, F, FM, M, ML, L, XL';
    for (const s of ['65', 'mf', '6', 150, 'XXL'])
      expect(error(raw('spreader.placed', { spreader: s, depthMm: 13 }))).toBe(msg);
  });
  it('checks FDI numbers, primary teeth included (ISO 3950 — seen)', () => {
    const opened = (data: unknown) => error(raw('case.opened', data, { canalId: undefined }));
    expect(opened({ setting: 'extracted', tooth: 55 })).toBe('accepted');
    expect(opened({ setting: 'extracted', tooth: 56 })).toContain('tooth must be an FDI tooth number');
    expect(opened({ setting: 'extracted', tooth: 19 })).toContain('tooth must be an FDI tooth number');
  });
  it('requires a tooth except on a training block, and a chart number for patients only', () => {
    const opened = (data: unknown) => error(raw('case.opened', data, { canalId: undefined }));
    expect(opened({ setting: 'block' })).toBe('accepted');
    expect(opened({ setting: 'extracted' })).toBe('tooth is required for an extracted tooth');
    expect(opened({ setting: 'patient', tooth: 36 })).toBe('chartRef is required for a patient');
    expect(opened({ setting: 'patient', tooth: 36, chartRef: ' DEMO-7 ' })).toBe('accepted');
    expect(opened({ setting: 'extracted', tooth: 36, chartRef: 'DEMO-7' })).toBe(
      'chartRef is allowed only for a patient',
    );
    expect(opened({ setting: 'lab' })).toBe('setting must be one of block, extracted, patient');
  });
  it('keeps case-level events off canals and canal steps on them', () => {
    expect(error(raw('case.submitted', {}))).toBe('canalId must be absent on case.submitted, which is case-level');
    expect(error(raw('master.seated', { sealer: 'zoe' }, { canalId: undefined }))).toBe(
      'canalId is required on master.seated',
    );
    expect(error(raw('radiograph.taken', { purpose: 'maf' }, { canalId: undefined }))).toBe(
      'canalId is required on radiograph.taken with purpose maf',
    );
    for (const [type, data] of [
      ['radiograph.taken', { purpose: 'post-op' }],
      ['access.restored', { kind: 'temporary' }],
      ['note.added', { text: 'ok' }],
      ['event.voided', { eventId: CANAL, reason: '' }],
    ] as const) {
      expect(error(raw(type, data, { canalId: undefined })), type).toBe('accepted');
    }
  });
  it('refuses an unknown type, a missing type, a bad id and a bad instant', () => {
    expect(error(raw('foo.bar', {}))).toBe('unknown event type "foo.bar"');
    expect(error(raw('gp.compacted', {}, { type: undefined }))).toBe('type is required');
    expect(error(raw('gp.compacted', {}, { id: 'not-a-uuid' }))).toBe('id must be a UUID');
    expect(error(raw('gp.compacted', {}, { at: '2026-12-02 09:41' }))).toBe(
      'at must be an ISO 8601 instant with a time zone, such as 2026-12-02T09:41:07.250Z',
    );
    expect(error(raw('gp.compacted', {}, { at: '2026-12-02T09:41:07' }))).toContain('at must be an ISO 8601 instant');
  });
  it('refuses an instant more than a day ahead of the clock, and accepts one exactly a day ahead', () => {
    expect(error(raw('gp.compacted', {}, { at: '2026-12-04T09:00:00.001Z' }))).toBe(
      'at is more than a day ahead of the server clock',
    );
    expect(error(raw('gp.compacted', {}, { at: '2026-12-04T09:00:00.000Z' }))).toBe('accepted');
    expect(error(raw('gp.compacted', {}, { at: '2026-12-04T10:00:00.000+01:00' }))).toBe('accepted');
  });
  it('accepts a step with no data, and refuses data that is not an object', () => {
    expect(error(raw('gp.compacted', undefined))).toBe('accepted');
    expect(error(raw('spreader.placed', undefined))).toBe('data is required');
    expect(error(raw('spreader.placed', 'MF 13'))).toBe('data must be an object');
  });
  it('never throws, whatever it is given', () => {
    const hostile = {
      get id(): string {
        throw new Error('boom');
      },
    };
    for (const x of [null, undefined, 0, '', [], {}, hostile, Symbol('x'), () => 1, new Date()]) {
      expect(parseEvent(x, NOW).ok).toBe(false);
    }
  });
});

describe('formatZodError', () => {
  it('turns zod’s own messages into sentences naming the field', () => {
    const r = z
      .object({ data: z.object({ depthMm: z.number(), result: z.enum(['seated', 'short']) }) })
      .safeParse({ data: { result: 'x' } });
    expect(r.success).toBe(false);
    if (!r.success) expect(formatZodError(r.error)).toBe('depthMm is required');
    const e = z.object({ result: z.enum(['seated', 'short']) }).safeParse({ result: 'x' });
    if (!e.success) expect(formatZodError(e.error)).toBe('result must be one of seated, short');
  });
});

describe('canonicalEvent', () => {
  it('gives the same string for the same event however it was written', () => {
    const a = parseEvent(raw('master.fitted', { size: 35, lengthMm: 21, reachedLength: true }), NOW);
    const b = parseEvent(
      {
        data: { reachedLength: true, lengthMm: 21, size: '35', ignored: 1 },
        at: '2026-12-02T09:41:07.250Z',
        type: 'master.fitted',
        canalId: CANAL.toUpperCase(),
        caseId: CASE,
        id: uuidFor(0xe1),
      },
      NOW,
    );
    if (!a.ok || !b.ok) throw new Error('rejected');
    expect(canonicalEvent(a.event)).toBe(canonicalEvent(b.event));
    expect(canonicalEvent(a.event)).toBe(
      `{"at":"2026-12-02T09:41:07.250Z","canalId":"${CANAL}","caseId":"${CASE}","data":{"lengthMm":21,"reachedLength":true,"size":"35"},"id":"${uuidFor(0xe1)}","type":"master.fitted"}`,
    );
  });
  it('tells other content apart', () => {
    const a = parseEvent(raw('spreader.placed', { spreader: 'MF', depthMm: 13.5 }), NOW);
    const b = parseEvent(raw('spreader.placed', { spreader: 'MF', depthMm: 14 }), NOW);
    if (!a.ok || !b.ok) throw new Error('rejected');
    expect(canonicalEvent(a.event)).not.toBe(canonicalEvent(b.event));
  });
});
