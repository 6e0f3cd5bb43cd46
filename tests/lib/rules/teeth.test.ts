import { describe, expect, it } from 'vitest';
import {
  averageLengthMm,
  fdiToUniversal,
  isValidFdi,
  referencePointsFor,
  toothGroup,
  toothName,
  universalToFdi,
  usualCanals,
} from '../../../src/lib/rules';

describe('isValidFdi', () => {
  it('accepts quadrants 1–4 with teeth 1–8 and primary quadrants 5–8 with teeth 1–5 (ISO 3950 — seen)', () => {
    for (const n of [11, 18, 28, 36, 48, 51, 55, 65, 75, 85]) expect(isValidFdi(n), String(n)).toBe(true);
    for (const n of [10, 19, 49, 56, 59, 86, 90, 9, 0, -11, 36.5, Number.NaN])
      expect(isValidFdi(n), String(n)).toBe(false);
  });
});

describe('fdiToUniversal', () => {
  it('converts the HL7 FHIR pairs 36 ↔ 19, 11 ↔ 8, 18 ↔ 1, 21 ↔ 9, 46 ↔ 30 (HL7 FHIR tooth value sets — seen)', () => {
    expect(fdiToUniversal(36)).toBe('19');
    expect(fdiToUniversal(11)).toBe('8');
    expect(fdiToUniversal(18)).toBe('1');
    expect(fdiToUniversal(21)).toBe('9');
    expect(fdiToUniversal(46)).toBe('30');
  });
  it('letters primary teeth A–T from the upper right (memory)', () => {
    expect([55, 51, 61, 65, 75, 71, 81, 85].map(fdiToUniversal)).toEqual(['A', 'E', 'F', 'J', 'K', 'O', 'P', 'T']);
  });
  it('returns an empty string for an invalid number', () => {
    expect(fdiToUniversal(19)).toBe('');
  });
  it('round-trips every valid tooth through universalToFdi', () => {
    for (let n = 0; n < 100; n++) if (isValidFdi(n)) expect(universalToFdi(fdiToUniversal(n))).toBe(n);
  });
});

describe('universalToFdi', () => {
  it('converts 19 → 36, 8 → 11, 1 → 18 as numbers or strings (HL7 FHIR — seen)', () => {
    expect(universalToFdi(19)).toBe(36);
    expect(universalToFdi('8')).toBe(11);
    expect(universalToFdi(1)).toBe(18);
    expect(universalToFdi('t')).toBe(85);
  });
  it('returns null for anything else', () => {
    for (const u of [0, 33, 1.5, '', 'U', '019x', 'AB']) expect(universalToFdi(u)).toBeNull();
  });
});

describe('toothGroup', () => {
  it('groups a mandibular left first molar', () => {
    expect(toothGroup(36)).toEqual({
      arch: 'mandibular',
      kind: 'molar',
      anterior: false,
      primary: false,
      side: 'left',
    });
  });
  it('counts FDI x1–x3 as anterior (dental anatomy — memory)', () => {
    expect([11, 12, 13, 14, 43, 53, 54].map((n) => toothGroup(n).anterior)).toEqual([
      true,
      true,
      true,
      false,
      true,
      true,
      false,
    ]);
  });
  it('calls primary teeth 4 and 5 molars', () => {
    expect(toothGroup(54)).toMatchObject({ kind: 'molar', primary: true, arch: 'maxillary', side: 'right' });
    expect(toothGroup(15).kind).toBe('premolar');
  });
  it('throws a RangeError for an invalid number', () => {
    expect(() => toothGroup(19)).toThrow(RangeError);
  });
});

describe('toothName', () => {
  it('names teeth in plain words', () => {
    expect(toothName(36)).toBe('mandibular left first molar');
    expect(toothName(11)).toBe('maxillary right central incisor');
    expect(toothName(54)).toBe('maxillary right primary first molar');
    expect(toothName(99)).toBe('');
  });
});

describe('usualCanals', () => {
  it('proposes MB, DB, P with MB2 to add for a maxillary first molar (Vertucci 1984 and CBCT studies — seen / partly)', () => {
    expect(usualCanals(16)).toEqual({ canals: ['MB', 'DB', 'P'], optional: ['MB2'] });
  });
  it('proposes MB, ML, D for a mandibular first molar (Vertucci 1984 — seen)', () => {
    expect(usualCanals(36).canals).toEqual(['MB', 'ML', 'D']);
  });
  it('proposes B and L for a maxillary first premolar and one canal for maxillary anteriors (seen)', () => {
    expect(usualCanals(24).canals).toEqual(['B', 'L']);
    for (const n of [11, 12, 13, 21, 22, 23]) expect(usualCanals(n).canals).toHaveLength(1);
  });
  it('proposes nothing for an invalid number', () => {
    expect(usualCanals(0)).toEqual({ canals: [], optional: [] });
  });
});

describe('referencePointsFor', () => {
  it('offers "block top" on a training block and the incisal edge or cusp tips on a tooth', () => {
    expect(referencePointsFor(undefined)).toEqual(['block top']);
    expect(referencePointsFor(11)).toEqual(['incisal edge']);
    expect(referencePointsFor(13)).toEqual(['cusp tip']);
    expect(referencePointsFor(36)).toContain('mesiobuccal cusp tip');
  });
});

describe('averageLengthMm', () => {
  it('gives maxillary central 23.5, lateral 22, canine 27 mm (Grossman 2020, table 13.2 — seen)', () => {
    expect([11, 12, 13, 21].map(averageLengthMm)).toEqual([23.5, 22, 27, 23.5]);
  });
  it('takes the midpoint of the maxillary first premolar range 21.5–23 mm (Grossman 2020 — seen)', () => {
    expect(averageLengthMm(14)).toBe(22.25);
  });
  it('gives mandibular central 20.7, lateral 21.1, first premolar 22.5 mm (textbooks, PMC4195450 — seen, sources differ)', () => {
    expect([31, 32, 34].map(averageLengthMm)).toEqual([20.7, 21.1, 22.5]);
  });
  it('gives 21 mm for first and second molars (about 20–22 mm — memory)', () => {
    expect([16, 17, 36, 47].map(averageLengthMm)).toEqual([21, 21, 21, 21]);
  });
  it('has no value where the table has none', () => {
    expect([15, 33, 35, 18, 38, 55, 99].map(averageLengthMm)).toEqual([null, null, null, null, null, null, null]);
  });
});
