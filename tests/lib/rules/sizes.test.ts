import { describe, expect, it } from 'vitest';
import {
  diameterAtMm,
  isConeSize,
  isIsoSize,
  isoColour,
  ISO_SIZES,
  NON_STANDARD_SIZES,
  normaliseSize,
  tipDiameterMm,
} from '../../../src/lib/rules';

describe('ISO_SIZES', () => {
  it('lists 06, 08, 10, then 15–60 by 5, then 70–140 by 10 (ISO 3630-1 — memory)', () => {
    expect(ISO_SIZES).toEqual([
      '06',
      '08',
      '10',
      '15',
      '20',
      '25',
      '30',
      '35',
      '40',
      '45',
      '50',
      '55',
      '60',
      '70',
      '80',
      '90',
      '100',
      '110',
      '120',
      '130',
      '140',
    ]);
  });
});

describe('NON_STANDARD_SIZES', () => {
  it('lists the designations XF to XL (ISO 6877 — memory)', () => {
    expect(NON_STANDARD_SIZES).toEqual(['XF', 'FF', 'MF', 'F', 'FM', 'M', 'ML', 'L', 'XL']);
  });
});

describe('isIsoSize and isConeSize', () => {
  it('accept sizes only as the contract writes them', () => {
    expect(isIsoSize('06')).toBe(true);
    expect(isIsoSize('6')).toBe(false);
    expect(isIsoSize('65')).toBe(false);
    expect(isIsoSize('MF')).toBe(false);
    expect(isConeSize('MF')).toBe(true);
    expect(isConeSize('mf')).toBe(false);
    expect(isConeSize('150')).toBe(false);
  });
});

describe('normaliseSize', () => {
  it('reads a number as the ISO size it names, with the leading zero for 06 and 08', () => {
    expect(normaliseSize(35)).toBe('35');
    expect(normaliseSize(6)).toBe('06');
    expect(normaliseSize(8)).toBe('08');
    expect(normaliseSize(140)).toBe('140');
  });
  it('keeps strings as written and refuses anything else', () => {
    expect(normaliseSize('35')).toBe('35');
    expect(normaliseSize('XF')).toBe('XF');
    for (const bad of ['6', 'mf', ' 35', 35.5, 65, -10, 0, null, undefined, {}, [], true, Number.NaN])
      expect(normaliseSize(bad)).toBeNull();
  });
});

describe('isoColour', () => {
  it('gives white, yellow, red, blue, green, black for 15–40 (ISO 3630-1 — memory)', () => {
    expect(['15', '20', '25', '30', '35', '40'].map((s) => isoColour(s)?.name)).toEqual([
      'white',
      'yellow',
      'red',
      'blue',
      'green',
      'black',
    ]);
  });
  it('repeats the cycle for 45–80 and 90–140 (ISO 3630-1 — memory)', () => {
    expect(['45', '50', '55', '60', '70', '80'].map((s) => isoColour(s)?.name)).toEqual([
      'white',
      'yellow',
      'red',
      'blue',
      'green',
      'black',
    ]);
    expect(['90', '100', '110', '120', '130', '140'].map((s) => isoColour(s)?.name)).toEqual([
      'white',
      'yellow',
      'red',
      'blue',
      'green',
      'black',
    ]);
  });
  it('gives 06 pink, 08 grey, 10 purple (ISO 3630-1 — memory)', () => {
    expect(['06', '08', '10'].map((s) => isoColour(s)?.name)).toEqual(['pink', 'grey', 'purple']);
  });
  it('has no colour for a designation', () => {
    expect(isoColour('MF')).toBeNull();
  });
  it('pairs every colour with a text colour of at least 4.5:1 contrast (WCAG AA)', () => {
    const lum = (hex: string) => {
      const [r, g, b] = [1, 3, 5].map((i) => {
        const c = parseInt(hex.slice(i, i + 2), 16) / 255;
        return c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
      }) as [number, number, number];
      return 0.2126 * r + 0.7152 * g + 0.0722 * b;
    };
    for (const s of ISO_SIZES) {
      const c = isoColour(s);
      if (c === null) throw new Error(`no colour for ${s}`);
      const [hi, lo] = [lum(c.hex), lum(c.textHex)].sort((a, b) => b - a) as [number, number];
      expect((hi + 0.05) / (lo + 0.05), `${s} ${c.name}`).toBeGreaterThanOrEqual(4.5);
    }
  });
});

describe('tipDiameterMm', () => {
  it('reads the ISO size as hundredths of a millimetre: size 30 → 0.30 mm (ISO 3630-1; ADA Spec. No. 28 — seen)', () => {
    expect(tipDiameterMm('30')).toBe(0.3);
    expect(tipDiameterMm('06')).toBe(0.06);
  });
  it('is not a number for a designation', () => {
    expect(tipDiameterMm('MF')).toBeNaN();
  });
});

describe('diameterAtMm', () => {
  it('gives D16 of size 30 = 0.62 mm with the standard 0.02 taper (ADA Spec. No. 28 as quoted — partly; D16 is arithmetic)', () => {
    expect(diameterAtMm('30', 16)).toBe(0.62);
  });
  it('takes another taper', () => {
    expect(diameterAtMm('25', 10, 0.04)).toBe(0.65);
    expect(diameterAtMm('25', 0)).toBe(0.25);
  });
  it('is not a number for a designation or a negative distance', () => {
    expect(diameterAtMm('F', 16)).toBeNaN();
    expect(diameterAtMm('30', -1)).toBeNaN();
  });
});
