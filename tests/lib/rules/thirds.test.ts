import { describe, expect, it } from 'vitest';
import {
  averageLengthMm,
  canalThirds,
  DEFAULT_TOLERANCES,
  fallbackStopDepthFor,
  STOP_DEPTH_REFERENCE_LENGTH_MM,
} from '../../../src/lib/rules';
import { canal, only } from './builder';

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

describe('fallbackStopDepthFor', () => {
  // Judgement: s × A / 21 on permanent anterior teeth; A from averageLengthMm (references.md).
  it('scales the stop depth by the average length of an anterior tooth over 21 mm (judgement)', () => {
    expect(fallbackStopDepthFor(13, 12)).toBeCloseTo((12 * 27) / 21, 10); // maxillary canine, Grossman — seen
    expect(fallbackStopDepthFor(11, 12)).toBeCloseTo((12 * 23.5) / 21, 10); // maxillary central, Grossman — seen
    expect(fallbackStopDepthFor(31, 12)).toBeCloseTo((12 * 20.7) / 21, 10); // mandibular central — memory
    expect(fallbackStopDepthFor(43, 10)).toBeCloseTo((10 * 27) / 21, 10); // mandibular canine, Wheeler — memory
  });
  it('uses the average length averageLengthMm gives, for every permanent anterior tooth', () => {
    for (const q of [1, 2, 3, 4])
      for (const t of [1, 2, 3]) {
        const n = q * 10 + t;
        expect(fallbackStopDepthFor(n, 12), String(n)).toBeCloseTo(
          (12 * (averageLengthMm(n) ?? Number.NaN)) / STOP_DEPTH_REFERENCE_LENGTH_MM,
          10,
        );
      }
  });
  it('keeps s for premolars, molars, primary teeth, invalid numbers and no tooth', () => {
    for (const n of [14, 15, 34, 36, 17, 18, 51, 53, 83, 99, 0])
      expect(fallbackStopDepthFor(n, 12), String(n)).toBe(12);
    expect(fallbackStopDepthFor(undefined, 12)).toBe(12);
  });
});

describe('canalThirds on an anterior tooth', () => {
  it('ends the estimated coronal third at the scaled stop depth: maxillary canine, CWL 26, s = 12 → 15.43 mm', () => {
    const t = canalThirds(26, undefined, 12, 13);
    expect(t.estimated).toBe(true);
    expect(t.coronalEndMm).toBeCloseTo((12 * 27) / 21, 10);
    expect(t.orificeMm).toBeCloseTo((3 * ((12 * 27) / 21) - 26) / 2, 10);
  });
  it('leaves a molar’s and a premolar’s estimate as it was (21 mm is the reference length)', () => {
    expect(canalThirds(21, undefined, 12, 36)).toEqual(canalThirds(21, undefined, 12));
    expect(canalThirds(22, undefined, 12, 15)).toEqual(canalThirds(22, undefined, 12));
  });
  it('ignores the tooth when the orifice depth was recorded', () => {
    expect(canalThirds(26, 9, 12, 13)).toEqual(canalThirds(26, 9, 12));
  });
  it('judges compaction on a maxillary canine by the scaled coronal third (compaction-incomplete)', () => {
    // CWL 26 on 13: the coronal third ends at 15.43 mm, not 12 mm. Spreader depths 24.5 … 15.5, 12.5.
    const stillPast = canal({ tooth: 13, cwlMm: 26, omit: ['sp5', 'acc5'] });
    expect(only(stillPast.evaluate(), 'compaction-incomplete')).toHaveLength(1);
    expect(only(stillPast.evaluate(), 'compaction-incomplete')[0]?.message).toContain(
      "15.43 mm, from the 12.0 mm rule of thumb scaled to this tooth type's average length",
    );
    const done = canal({ tooth: 13, cwlMm: 26, patch: { sp5: { depthMm: 15 }, acc5: { lengthMm: 15 } } });
    expect(only(done.evaluate(), 'compaction-incomplete')).toEqual([]);
    expect(done.evaluate().state.complete).toBe(true);
  });
  it('scales a director’s stop depth too, at the bounds of its range (8 and 16 mm)', () => {
    expect(canalThirds(30, undefined, 8, 13).coronalEndMm).toBeCloseTo((8 * 27) / 21, 10);
    expect(canalThirds(34, undefined, 16, 13).coronalEndMm).toBeCloseTo((16 * 27) / 21, 10);
  });
});
