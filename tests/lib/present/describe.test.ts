import { describe, expect, it } from 'vitest';
import { describeEvent } from '../../../src/lib/present/events';

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
      'Seared at the orifice (1.0 mm to the CEJ)',
    );
  });
});
