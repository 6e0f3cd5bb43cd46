// Tooth numbers: FDI two-digit notation (ISO 3950 — seen) and the Universal system
// (pairs as listed in the HL7 FHIR tooth value sets — seen).
import { TEAM_KNOWLEDGE, type Sourced } from './labels';

/** Where each numbering comes from (docs/references.md, "Values in the code"). */
export const TOOTH_NUMBER_SOURCES = {
  fdi: { source: 'ISO 3950, as documented publicly', label: 'seen' },
  universal: { source: 'HL7 FHIR tooth value sets list the pairs; the formula matches them', label: 'seen' },
  universalPrimary: { source: TEAM_KNOWLEDGE, label: 'memory' },
} as const satisfies Record<string, Sourced>;

/** True for an FDI number that exists: permanent 11–48 (quadrants 1–4, teeth 1–8), primary 51–85 (quadrants 5–8, teeth 1–5). */
export function isValidFdi(n: number): boolean {
  if (typeof n !== 'number' || !Number.isInteger(n)) return false;
  const q = Math.floor(n / 10);
  const t = n % 10;
  if (q >= 1 && q <= 4) return t >= 1 && t <= 8;
  if (q >= 5 && q <= 8) return t >= 1 && t <= 5;
  return false;
}

const PRIMARY_LETTERS = 'ABCDEFGHIJKLMNOPQRST';

/**
 * FDI → Universal: permanent teeth "1".."32" (q1: 9 − t, q2: 8 + t, q3: 25 − t, q4: 24 + t,
 * e.g. 18 → "1", 11 → "8", 36 → "19"); primary teeth "A".."T" (55 → "A", 65 → "J",
 * 75 → "K", 85 → "T"). Returns "" for a number that is not a valid FDI tooth.
 */
export function fdiToUniversal(n: number): string {
  if (!isValidFdi(n)) return '';
  const q = Math.floor(n / 10);
  const t = n % 10;
  switch (q) {
    case 1:
      return String(9 - t);
    case 2:
      return String(8 + t);
    case 3:
      return String(25 - t);
    case 4:
      return String(24 + t);
    case 5:
      return PRIMARY_LETTERS.charAt(5 - t);
    case 6:
      return PRIMARY_LETTERS.charAt(4 + t);
    case 7:
      return PRIMARY_LETTERS.charAt(15 - t);
    default:
      return PRIMARY_LETTERS.charAt(14 + t);
  }
}

/** Universal → FDI: 1–32 (number or numeric string) or a letter A–T (either case); null for anything else. */
export function universalToFdi(u: string | number): number | null {
  if (typeof u === 'number') {
    if (!Number.isInteger(u) || u < 1 || u > 32) return null;
    if (u <= 8) return 10 + (9 - u);
    if (u <= 16) return 20 + (u - 8);
    if (u <= 24) return 30 + (25 - u);
    return 40 + (u - 24);
  }
  if (typeof u !== 'string') return null;
  const s = u.trim();
  if (/^[1-9]\d?$/.test(s)) return universalToFdi(Number(s));
  if (!/^[A-Ta-t]$/.test(s)) return null;
  const i = PRIMARY_LETTERS.indexOf(s.toUpperCase());
  if (i <= 4) return 50 + (5 - i);
  if (i <= 9) return 60 + (i - 4);
  if (i <= 14) return 70 + (15 - i);
  return 80 + (i - 14);
}

export type ToothKind = 'incisor' | 'canine' | 'premolar' | 'molar';
export interface ToothGroup {
  arch: 'maxillary' | 'mandibular';
  kind: ToothKind;
  /** Incisors and canines, FDI x1–x3 (dental anatomy — memory). */
  anterior: boolean;
  primary: boolean;
  /** The patient's side. */
  side: 'right' | 'left';
}

/** The group of an FDI tooth. Throws a RangeError for an invalid number (check with isValidFdi first). */
export function toothGroup(n: number): ToothGroup {
  if (!isValidFdi(n)) throw new RangeError(`${String(n)} is not an FDI tooth number`);
  const q = Math.floor(n / 10);
  const t = n % 10;
  const primary = q >= 5;
  const arch = q === 1 || q === 2 || q === 5 || q === 6 ? 'maxillary' : 'mandibular';
  const side = q === 1 || q === 4 || q === 5 || q === 8 ? 'right' : 'left';
  // Primary teeth 4 and 5 are the first and second primary molars: there are no primary premolars.
  const kind: ToothKind = t <= 2 ? 'incisor' : t === 3 ? 'canine' : primary || t >= 6 ? 'molar' : 'premolar';
  return { arch, kind, anterior: t <= 3, primary, side };
}

const PERMANENT_NAMES = [
  '',
  'central incisor',
  'lateral incisor',
  'canine',
  'first premolar',
  'second premolar',
  'first molar',
  'second molar',
  'third molar',
];
const PRIMARY_NAMES = ['', 'central incisor', 'lateral incisor', 'canine', 'first molar', 'second molar'];

/** Plain name of an FDI tooth, e.g. 36 → "mandibular left first molar", 54 → "maxillary right primary first molar"; "" when invalid. */
export function toothName(n: number): string {
  if (!isValidFdi(n)) return '';
  const g = toothGroup(n);
  const t = n % 10;
  const name = g.primary ? PRIMARY_NAMES[t] : PERMANENT_NAMES[t];
  return `${g.arch} ${g.side} ${g.primary ? 'primary ' : ''}${name ?? ''}`;
}
