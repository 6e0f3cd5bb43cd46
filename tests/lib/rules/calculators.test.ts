import { describe, expect, it } from 'vitest';
import {
  proportionalLength,
  roundToHalf,
  stepBackSchedule,
  workingLengthByDiscrepancy,
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
