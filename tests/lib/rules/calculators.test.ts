import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  floorToHalf,
  ISO_CUTTING_LENGTH_MM,
  ISO_SIZES,
  isoSizeRow,
  proportionalLength,
  resorptionAllowanceMm,
  RESORPTIONS,
  roundToHalf,
  stepBackSchedule,
  workingLengthByDiscrepancy,
  workingLengthByProportion,
  workingLengthFromApexLocator,
} from '../../../src/lib/rules';

describe('workingLengthByDiscrepancy', () => {
  it('gives 22.0 + 2.0 − 1 = 23.0 mm for a file 2 mm short (Ingle; Weine; Grossman 13th ed. — seen; worked example computed)', () => {
    expect(workingLengthByDiscrepancy(22, 2)).toEqual({ actualLengthMm: 24, workingLengthMm: 23 });
  });
  it('subtracts 1.5 mm with bone resorption and 2 mm with bone and root resorption (seen)', () => {
    expect(workingLengthByDiscrepancy(22, 2, 'bone').workingLengthMm).toBe(22.5);
    expect(workingLengthByDiscrepancy(22, 2, 'bone-and-root').workingLengthMm).toBe(22);
  });
  it('takes a negative distance for a file beyond the apex', () => {
    expect(workingLengthByDiscrepancy(22, -1)).toEqual({ actualLengthMm: 21, workingLengthMm: 20 });
  });
  it('gives NaN for a file length that is not positive', () => {
    expect(workingLengthByDiscrepancy(0, 2).workingLengthMm).toBeNaN();
  });
});

describe('workingLengthFromApexLocator', () => {
  it('backs off 0.5 mm by default and up to 1.0 mm (Jung et al., J Endod; BioMed Res Int 2020 — seen)', () => {
    expect(workingLengthFromApexLocator(22)).toBe(21.5);
    expect(workingLengthFromApexLocator(22, 1.0)).toBe(21);
  });
  it('refuses a back-off outside 0.5–1.0 mm', () => {
    expect(workingLengthFromApexLocator(22, 1.5)).toBeNaN();
    expect(workingLengthFromApexLocator(22, 0.25)).toBeNaN();
  });
});

describe('proportionalLength', () => {
  it('gives 20.0 × 25.0 ÷ 22.0 = 22.73 mm (Grossman / Best, secondary — seen; worked example computed)', () => {
    expect(proportionalLength(20, 25, 22)).toBe(22.73);
  });
  it('gives NaN unless every length is positive', () => {
    expect(proportionalLength(20, 25, 0)).toBeNaN();
  });
});

describe('stepBackSchedule', () => {
  it('steps MAF 25 back to 30, 35, 40 at 1, 2, 3 mm short (Mullaney 1979 — seen)', () => {
    expect(stepBackSchedule('25', 21, 1.0)).toEqual([
      { size: '30', lengthMm: 20 },
      { size: '35', lengthMm: 19 },
      { size: '40', lengthMm: 18 },
    ]);
  });
  it('steps 0.5 mm per size when asked (Allison, Weber & Walton 1979 — seen; Mullaney uses 1.0 mm)', () => {
    expect(stepBackSchedule('25', 21, 0.5, 4).map((s) => s.lengthMm)).toEqual([20.5, 20, 19.5, 19]);
  });
  it('crosses from 60 to 70 and stops at 140', () => {
    expect(stepBackSchedule('60', 21, 1.0).map((s) => s.size)).toEqual(['70', '80', '90']);
    expect(stepBackSchedule('130', 21, 1.0).map((s) => s.size)).toEqual(['140']);
  });
  it('gives no schedule for a designation', () => {
    expect(stepBackSchedule('MF', 21, 1.0)).toEqual([]);
  });
});

describe('roundToHalf', () => {
  it('rounds to the 0.5 mm ruler step', () => {
    expect(roundToHalf(22.73)).toBe(22.5);
    expect(roundToHalf(22.76)).toBe(23);
  });
});

describe('floorToHalf', () => {
  it("rounds Grossman's proportional method down: 20 × 25 ÷ 22 = 22.73 → 22.5 mm (Grossman's formula — seen, secondary; worked example computed)", () => {
    expect(floorToHalf(proportionalLength(20, 25, 22))).toBe(22.5);
  });
  it('never rounds up, even a hundredth short of the next step: 22.99 → 22.5, 22.51 → 22.5, 22.49 → 22.0', () => {
    expect(floorToHalf(22.99)).toBe(22.5);
    expect(floorToHalf(22.51)).toBe(22.5);
    expect(floorToHalf(22.49)).toBe(22);
    expect(floorToHalf(0.4)).toBe(0);
  });
  it('keeps a length already on the ruler step: 23.0 → 23.0, 22.5 → 22.5', () => {
    expect(floorToHalf(23)).toBe(23);
    expect(floorToHalf(22.5)).toBe(22.5);
    expect(floorToHalf(0)).toBe(0);
  });
  it('reads float noise below a step as the step, as the hundredths shown beside it do: 22.999999 → 23.0', () => {
    expect(floorToHalf(22.999999)).toBe(23);
    expect(floorToHalf(22.4999999999)).toBe(22.5);
    // 0.1 + 0.2 is 0.30000000000000004 and 21.7 − 0.2 is 21.499999999999996 in binary floating point.
    expect(floorToHalf(21.7 - 0.2)).toBe(21.5);
    expect(floorToHalf(20 + 0.1 + 0.2 + 0.2)).toBe(20.5);
  });
  it('rounds toward shorter below zero too, and gives NaN for what is not a finite number', () => {
    expect(floorToHalf(-0.3)).toBe(-0.5);
    expect(floorToHalf(Number.NaN)).toBeNaN();
    expect(floorToHalf(Number.POSITIVE_INFINITY)).toBeNaN();
    expect(floorToHalf('22' as unknown as number)).toBeNaN();
  });
  it('is never above its input by more than float noise, and never more than 0.5 mm below it (fixed seed)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 400_000 }), (tenThousandths) => {
        const mm = tenThousandths / 10_000;
        const f = floorToHalf(mm);
        expect(Number.isInteger(f * 2)).toBe(true);
        expect(f).toBeLessThanOrEqual(mm + 0.005);
        expect(mm - f).toBeLessThan(0.5);
      }),
      { seed: 20_260_315, numRuns: 2000 },
    );
  });
});

describe('workingLengthByDiscrepancy with floorToHalf', () => {
  it('shows 22.0 + 1.3 − 1 = 22.30 as 22.0 mm (Ingle; Weine; Grossman 13th ed. — seen; computed)', () => {
    const { workingLengthMm } = workingLengthByDiscrepancy(22, 1.3);
    expect(workingLengthMm).toBe(22.3);
    expect(floorToHalf(workingLengthMm)).toBe(22);
  });
});

describe('workingLengthFromApexLocator with floorToHalf', () => {
  it('shows a reading of 21.3 mm backed off 0.5 mm (20.80) as 20.5 mm (Jung et al. — seen; computed)', () => {
    expect(floorToHalf(workingLengthFromApexLocator(21.3))).toBe(20.5);
  });
});

describe('workingLengthByProportion', () => {
  it("takes the radiographic method's 1 mm off Grossman's 22.73 mm: 21.73, shown as 21.5 mm (Grossman's formula — seen, secondary; the allowance here is Coneline's judgement; computed)", () => {
    const r = workingLengthByProportion(20, 25, 22);
    expect(r).toEqual({ actualLengthMm: 22.73, workingLengthMm: 21.73 });
    expect(floorToHalf(r.workingLengthMm)).toBe(21.5);
  });
  it('takes 1.5 mm with bone resorption and 2 mm with bone and root resorption', () => {
    expect(workingLengthByProportion(20, 25, 22, 'bone').workingLengthMm).toBe(21.23);
    expect(workingLengthByProportion(20, 25, 22, 'bone-and-root').workingLengthMm).toBe(20.73);
  });
  it('gives NaN unless every length is positive, and for a resorption it does not know', () => {
    expect(workingLengthByProportion(20, 0, 22).workingLengthMm).toBeNaN();
    expect(workingLengthByProportion(20, 25, 22, 'root' as never).workingLengthMm).toBeNaN();
  });
});

describe('resorptionAllowanceMm', () => {
  it('is 1, 1.5 and 2 mm for none, bone, and bone and root resorption (Ingle; Weine; Grossman 13th ed. — seen)', () => {
    expect(RESORPTIONS.map(resorptionAllowanceMm)).toEqual([1, 1.5, 2]);
  });
});

describe('isoSizeRow', () => {
  it('gives size 30 blue with D0 0.30 mm and D16 0.62 mm (ISO 3630-1; ANSI/ADA Specification No. 28 — memory; D16 computed)', () => {
    expect(isoSizeRow('30')).toEqual({
      size: '30',
      colour: 'blue',
      hex: '#1F5BB8',
      textHex: '#FFFFFF',
      d0Mm: 0.3,
      d16Mm: 0.62,
    });
  });
  it('gives size 06 pink with D16 0.38 mm and size 140 black with D16 1.72 mm (ISO 3630-1 — memory; computed)', () => {
    expect(isoSizeRow('06')).toMatchObject({ colour: 'pink', d0Mm: 0.06, d16Mm: 0.38 });
    expect(isoSizeRow('140')).toMatchObject({ colour: 'black', d0Mm: 1.4, d16Mm: 1.72 });
  });
  it('adds 0.32 mm from D0 to D16 for every ISO size, over the 16 mm cutting part', () => {
    expect(ISO_CUTTING_LENGTH_MM).toBe(16);
    for (const size of ISO_SIZES) {
      const row = isoSizeRow(size)!;
      expect(Math.round((row.d16Mm - row.d0Mm) * 1000), size).toBe(320);
    }
  });
  it('gives null for a designation', () => {
    expect(isoSizeRow('MF')).toBeNull();
  });
});
