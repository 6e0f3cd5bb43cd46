// Every tolerance at the bounds of its documented range (TOLERANCE_RANGES, docs/rules.md's
// "Tolerances" table): the bound itself is accepted, a hundredth beyond it is refused, and
// the rule that uses it behaves as documented at the bound. The ranges are our judgement.
import { describe, expect, it } from 'vitest';
import {
  canalThirds,
  DEFAULT_TOLERANCES,
  evaluateCanal,
  TOLERANCE_RANGES,
  toleranceInRange,
  type Tolerances,
} from '../../../src/lib/rules';
import { renderRulesDoc } from '../../../src/lib/rules/reference-doc';
import { canal, only } from './builder';

const KEYS = Object.keys(DEFAULT_TOLERANCES) as (keyof Tolerances)[];

describe('toleranceInRange', () => {
  it.each(KEYS)('accepts %s at its minimum and maximum and refuses 0.01 beyond either', (key) => {
    const { min, max } = TOLERANCE_RANGES[key];
    expect(min).toBeLessThan(max);
    expect(toleranceInRange(key, min)).toBe(true);
    expect(toleranceInRange(key, max)).toBe(true);
    expect(toleranceInRange(key, min - 0.01)).toBe(false);
    expect(toleranceInRange(key, max + 0.01)).toBe(false);
  });
});

describe('docs/rules.md’s tolerance table', () => {
  it.each(KEYS)('shows the range of %s in its own column', (key) => {
    const { min, max } = TOLERANCE_RANGES[key];
    const row = renderRulesDoc()
      .split('\n')
      .find((l) => l.startsWith(`| \`${key}\` |`));
    const cells = row?.split(' | ');
    expect(cells?.[2]).toBe(`${min}–${max}${key.endsWith('Mm') ? ' mm' : ''}`);
  });
});

// The rules at the bounds. The textbook canal (builder.ts) is a mandibular first molar, FDI 36,
// average 21 mm (memory), CWL 21 mm: taper check at 20, first spreader at 19.5, master cone 21.
describe('the rules at the bounds of their tolerances', () => {
  const R = TOLERANCE_RANGES;

  it('cone-fit-not-approved: 0 never stops a canal sealed unapproved; 1 stops it', () => {
    const stop = (v: number) => {
      const log = canal();
      const r = evaluateCanal(log.canalId, log.events, { requireConeFitApproval: v }, { coneFit: [] });
      return r === null ? -1 : only(r, 'cone-fit-not-approved').length;
    };
    expect(stop(R.requireConeFitApproval.min)).toBe(0);
    expect(stop(R.requireConeFitApproval.max)).toBe(1);
  });

  it('cwl-unusual-for-tooth: margin 1 mm notes 22.5 but not 22; margin 10 mm notes 31.5 but not 31', () => {
    const note = (cwlMm: number, m: number) =>
      only(canal({ cwlMm }).evaluate({ cwlUnusualMarginMm: m }), 'cwl-unusual-for-tooth').length;
    expect(note(22, R.cwlUnusualMarginMm.min)).toBe(0);
    expect(note(22.5, R.cwlUnusualMarginMm.min)).toBe(1);
    expect(note(31, R.cwlUnusualMarginMm.max)).toBe(0);
    expect(note(31.5, R.cwlUnusualMarginMm.max)).toBe(1);
  });

  it('taper-short: margin 0 stops a taper check 0.5 mm short; margin 3 mm passes 3 mm short and stops 3.5', () => {
    const stop = (depthMm: number, m: number) =>
      only(canal({ patch: { taper: { depthMm } } }).evaluate({ taperShortMarginMm: m }), 'taper-short').length;
    expect(stop(21, R.taperShortMarginMm.min)).toBe(0);
    expect(stop(20.5, R.taperShortMarginMm.min)).toBe(1);
    expect(stop(18, R.taperShortMarginMm.max)).toBe(0);
    expect(stop(17.5, R.taperShortMarginMm.max)).toBe(1);
  });

  it('master-length-mismatch: margin 0 stops a cone 0.5 mm short; margin 2 mm passes 2 mm short and stops 2.5', () => {
    const stop = (lengthMm: number, m: number) =>
      only(canal({ patch: { fit: { lengthMm } } }).evaluate({ masterLengthMarginMm: m }), 'master-length-mismatch')
        .length;
    expect(stop(21, R.masterLengthMarginMm.min)).toBe(0);
    expect(stop(20.5, R.masterLengthMarginMm.min)).toBe(1);
    expect(stop(19, R.masterLengthMarginMm.max)).toBe(0);
    expect(stop(18.5, R.masterLengthMarginMm.max)).toBe(1);
  });

  it('cone-fit-retake-needed: threshold 0.5 mm asks at a 0.5 mm refit; threshold 3 mm asks at 3 mm, not 2.5', () => {
    const retake = (lengthMm: number, t: number) => {
      const log = canal();
      log.add('refit', 'master.fitted', { size: '30', lengthMm, reachedLength: true }, { after: 'cone-fit-rad' });
      return only(log.evaluate({ coneFitRetakeThresholdMm: t }), 'cone-fit-retake-needed').length;
    };
    expect(retake(21, R.coneFitRetakeThresholdMm.min)).toBe(0);
    expect(retake(20.5, R.coneFitRetakeThresholdMm.min)).toBe(1);
    expect(retake(18.5, R.coneFitRetakeThresholdMm.max)).toBe(0);
    expect(retake(18, R.coneFitRetakeThresholdMm.max)).toBe(1);
  });

  it('first-spreader-short: margin 0.5 mm passes 0.5 short and cautions 1.0; margin 5 mm passes 5 short and cautions 5.5', () => {
    const caution = (depthMm: number, m: number) =>
      only(
        canal({ patch: { sp1: { depthMm }, acc1: { lengthMm: depthMm } } }).evaluate({ firstSpreaderMarginMm: m }),
        'first-spreader-short',
      ).length;
    expect(caution(20.5, R.firstSpreaderMarginMm.min)).toBe(0);
    expect(caution(20, R.firstSpreaderMarginMm.min)).toBe(1);
    expect(caution(16, R.firstSpreaderMarginMm.max)).toBe(0);
    expect(caution(15.5, R.firstSpreaderMarginMm.max)).toBe(1);
  });

  it('accessory-length-mismatch: margin 0 cautions a cone 0.5 mm off the spreader depth; margin 2 mm passes 2 and cautions 2.5', () => {
    const caution = (lengthMm: number, m: number) =>
      only(
        canal({ patch: { acc1: { lengthMm } } }).evaluate({ accessoryLengthMarginMm: m }),
        'accessory-length-mismatch',
      ).length;
    expect(caution(19.5, R.accessoryLengthMarginMm.min)).toBe(0);
    expect(caution(19, R.accessoryLengthMarginMm.min)).toBe(1);
    expect(caution(17.5, R.accessoryLengthMarginMm.max)).toBe(0);
    expect(caution(17, R.accessoryLengthMarginMm.max)).toBe(1);
  });

  it('few-accessory-cones: a minimum of 0 never notes; a minimum of 10 notes the textbook canal’s 4 cones', () => {
    const omit = ['sp1', 'acc1', 'sp2', 'acc2', 'sp3', 'acc3', 'sp4', 'acc4'];
    expect(
      only(canal({ omit }).evaluate({ minAccessoryCones: R.minAccessoryCones.min }), 'few-accessory-cones'),
    ).toEqual([]);
    expect(only(canal().evaluate({ minAccessoryCones: R.minAccessoryCones.max }), 'few-accessory-cones')).toHaveLength(
      1,
    );
    expect(only(canal().evaluate({ minAccessoryCones: 4 }), 'few-accessory-cones')).toEqual([]);
  });

  it('fallbackStopDepthMm: the estimated coronal third of a molar ends at 8 mm or 16 mm (CWL 21 and 30)', () => {
    expect(canalThirds(21, undefined, R.fallbackStopDepthMm.min, 36).coronalEndMm).toBeCloseTo(8, 10);
    expect(canalThirds(30, undefined, R.fallbackStopDepthMm.max, 36).coronalEndMm).toBeCloseTo(16, 10);
    // The same stop depth in the rules: the textbook canal's last spreader at 10.5 mm passes 8 mm.
    expect(
      only(canal().evaluate({ fallbackStopDepthMm: R.fallbackStopDepthMm.min }), 'compaction-incomplete'),
    ).toHaveLength(1);
    expect(only(canal().evaluate({ fallbackStopDepthMm: R.fallbackStopDepthMm.max }), 'compaction-incomplete')).toEqual(
      [],
    );
  });

  it('fill-short: a limit of 0.5 mm cautions a fill "short-over-2"; a limit of 3 mm does not (docs/rules.md)', () => {
    const caution = (limit: number) =>
      only(canal({ patch: { fill: { length: 'short-over-2' } } }).evaluate({ fillShortLimitMm: limit }), 'fill-short')
        .length;
    expect(caution(R.fillShortLimitMm.min)).toBe(1);
    expect(caution(R.fillShortLimitMm.max)).toBe(0);
  });
});
