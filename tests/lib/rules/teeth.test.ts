import { describe, expect, it } from 'vitest';
import {
  averageLengthMm,
  fdiToUniversal,
  isValidFdi,
  pickCanal,
  referencePointsFor,
  SINGLE_CANAL,
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
  it('offers a second canal, as the pair B and L, for mandibular incisors, mandibular first premolars and maxillary second premolars (Vertucci 1984 — memory)', () => {
    for (const n of [31, 32, 41, 42, 34, 44, 15, 25])
      expect(usualCanals(n), String(n)).toEqual({ canals: [SINGLE_CANAL], optional: ['B', 'L'] });
  });
  it('keeps one canal and offers none for the other single-canal teeth', () => {
    for (const n of [11, 12, 13, 21, 22, 23, 33, 43, 35, 45, 51, 71])
      expect(usualCanals(n), String(n)).toEqual({ canals: [SINGLE_CANAL], optional: [] });
  });
});

describe('pickCanal', () => {
  const incisor = usualCanals(31);
  it('puts B and L in place of the single canal when a second canal is added', () => {
    expect(pickCanal(incisor, [SINGLE_CANAL], 'L')).toEqual(['B', 'L']);
    expect(pickCanal(incisor, [SINGLE_CANAL], 'B')).toEqual(['B', 'L']);
  });
  it('keeps a canal the student named when the pair replaces the single canal', () => {
    expect(pickCanal(incisor, [SINGLE_CANAL, 'X'], 'L')).toEqual(['B', 'L', 'X']);
  });
  it('adds the one canal only once the single canal is not picked, and unpicks a picked canal', () => {
    expect(pickCanal(incisor, [], 'L')).toEqual(['L']);
    expect(pickCanal(incisor, ['B', 'L'], 'L')).toEqual(['B']);
    expect(pickCanal(incisor, [SINGLE_CANAL], SINGLE_CANAL)).toEqual([]);
  });
  it('adds beside the others on teeth with more canals (MB2 beside MB, DB, P)', () => {
    expect(pickCanal(usualCanals(16), ['MB', 'DB', 'P'], 'MB2')).toEqual(['MB', 'DB', 'P', 'MB2']);
    expect(pickCanal(usualCanals(24), ['B', 'L'], 'L')).toEqual(['B']);
  });
  it('adds a name typed by the student beside the single canal on a tooth with no second canal offered', () => {
    expect(pickCanal(usualCanals(11), [SINGLE_CANAL], 'L')).toEqual([SINGLE_CANAL, 'L']);
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
  it('gives mandibular central 20.7 and lateral 21.1 mm (team’s knowledge — memory; not in PMC4195450)', () => {
    expect([31, 32, 41, 42].map(averageLengthMm)).toEqual([20.7, 21.1, 20.7, 21.1]);
  });
  it('gives the mandibular first premolar 22.5 mm (PMC4195450 — seen)', () => {
    expect([34, 44].map(averageLengthMm)).toEqual([22.5, 22.5]);
  });
  it('gives the mandibular canine 27 mm and both second premolars 22.5 mm (Wheeler’s crown + root — memory)', () => {
    expect([33, 43].map(averageLengthMm)).toEqual([27, 27]);
    expect([15, 25, 35, 45].map(averageLengthMm)).toEqual([22.5, 22.5, 22.5, 22.5]);
  });
  it('gives 21 mm for first and second molars (about 20–22 mm — memory)', () => {
    expect([16, 17, 36, 47].map(averageLengthMm)).toEqual([21, 21, 21, 21]);
  });
  it('has a value for every permanent tooth but the third molars (judgement: they vary too much)', () => {
    for (const q of [1, 2, 3, 4])
      for (let t = 1; t <= 7; t++) expect(averageLengthMm(q * 10 + t), String(q * 10 + t)).toBeGreaterThan(0);
  });
  it('has no value for third molars, primary teeth and invalid numbers', () => {
    expect([18, 28, 38, 48, 55, 73, 99].map(averageLengthMm)).toEqual([null, null, null, null, null, null, null]);
  });
});
