import { describe, expect, it } from 'vitest';
import { describeEvent, withdrawals } from '../../../src/lib/present/events';

const e = (type: string, data: object) => ({
  id: 'x',
  caseId: 'c',
  canalId: 'k',
  type,
  at: '2026-03-02T09:00:00Z',
  data,
});

describe('describeEvent', () => {
  it('says what each tap recorded in plain words, lengths with one decimal', () => {
    expect(describeEvent(e('spreader.placed', { spreader: 'MF', depthMm: 17 }))).toBe('Spreader MF: 17.0 mm');
    expect(describeEvent(e('accessory.placed', { size: 'MF', lengthMm: 16.5, reachedLength: false }))).toBe(
      'Accessory cone MF: 16.5 mm, stopped short',
    );
    expect(describeEvent(e('canal.rinsed', { solutions: ['naocl', 'edta'] }))).toBe('Final rinse: NaOCl + EDTA');
    expect(describeEvent(e('gp.seared', { atOrifice: true, relativeToCejMm: 1 }))).toBe(
      'Seared at the orifice, 1.0 mm below the CEJ',
    );
  });
});

describe('describeEvent, for a sear level', () => {
  it('says below, above or at the CEJ, never a sign', () => {
    expect(describeEvent(e('gp.seared', { atOrifice: false, relativeToCejMm: -0.5 }))).toBe(
      'Seared elsewhere, 0.5 mm above the CEJ',
    );
    expect(describeEvent(e('gp.seared', { atOrifice: true, relativeToCejMm: 0 }))).toBe(
      'Seared at the orifice, at the CEJ',
    );
    expect(describeEvent(e('gp.seared', { atOrifice: true }))).toBe('Seared at the orifice');
  });
});

describe('describeEvent, for a withdrawal or a removed cone', () => {
  it('gives the reason recorded with it', () => {
    expect(describeEvent(e('event.voided', { eventId: 'a', reason: 'Undone on the tablet' }))).toBe(
      'Withdrawn: Undone on the tablet',
    );
    expect(describeEvent(e('accessory.removed', { eventId: 'a', reason: 'Stopped short of the spreader depth' }))).toBe(
      'Short cone removed: Stopped short of the spreader depth',
    );
    expect(describeEvent(e('event.voided', { eventId: 'a', reason: '' }))).toBe('Withdrawn');
  });
});

describe('withdrawals', () => {
  it('says what was withdrawn or taken out, and why, in the order recorded', () => {
    const taper = { ...e('taper.checked', { spreader: 'MF', depthMm: 19.5 }), id: 't' };
    const cone = { ...e('accessory.placed', { size: 'F', lengthMm: 15, reachedLength: false }), id: 'c' };
    const list = withdrawals([
      taper,
      { ...e('event.voided', { eventId: 't', reason: 'Withdrawn from the timeline' }), id: 'v' },
      cone,
      { ...e('accessory.removed', { eventId: 'c', reason: 'Stopped short of the spreader depth' }), id: 'r' },
      { ...e('event.voided', { eventId: 'gone', reason: '' }), id: 'w' },
    ]);
    expect(list).toEqual([
      { id: 'v', kind: 'withdrawn', what: 'Taper check, spreader MF: 19.5 mm', why: 'Withdrawn from the timeline' },
      {
        id: 'r',
        kind: 'removed',
        what: 'Accessory cone F: 15.0 mm, stopped short',
        why: 'Stopped short of the spreader depth',
      },
      { id: 'w', kind: 'withdrawn', what: 'An answer no longer on this record', why: 'no reason given' },
    ]);
  });
});
