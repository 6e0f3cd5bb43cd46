import { describe, expect, it } from 'vitest';
import { canalThirds, DEFAULT_TOLERANCES } from '../../../src/lib/rules';

describe('canalThirds', () => {
  it('divides the canal from a recorded orifice to the CWL', () => {
    expect(canalThirds(21, 9)).toEqual({
      orificeMm: 9,
      coronalEndMm: 13,
      middleEndMm: 17,
      cwlMm: 21,
      estimated: false,
    });
  });
  it('puts the orifice at 7.5 mm for a CWL of 21 mm with the 12 mm fallback stop depth (docs/rules.md; practice: 10–12 mm from a cusp tip)', () => {
    expect(canalThirds(21, undefined)).toEqual({
      orificeMm: 7.5,
      coronalEndMm: 12,
      middleEndMm: 16.5,
      cwlMm: 21,
      estimated: true,
    });
  });
  it('keeps the estimate within 0 and half the CWL', () => {
    expect(canalThirds(40, undefined).orificeMm).toBe(0);
    expect(canalThirds(10, undefined).orificeMm).toBe(5);
  });
  it('takes another fallback stop depth', () => {
    expect(canalThirds(21, undefined, 10).coronalEndMm).toBe(10);
  });
  it('uses 12 mm as the default fallback stop depth', () => {
    expect(DEFAULT_TOLERANCES.fallbackStopDepthMm).toBe(12);
  });
  it('takes a block top as orifice 0: the coronal third is the first third of the CWL', () => {
    expect(canalThirds(18, 0)).toMatchObject({ orificeMm: 0, coronalEndMm: 6, middleEndMm: 12, estimated: false });
  });
});
