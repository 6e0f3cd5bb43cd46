// Instrument and cone sizes: ISO 3630-1 (files, spreaders) and ISO 6877 (gutta-percha points).
// Values and labels as in docs/references.md; the standards themselves were not read here, so
// the values are memory unless said otherwise.
import type { Sourced } from './labels';

/** The source and label of each size table below (docs/references.md, "Values in the code"). */
export const SIZE_SOURCES = {
  isoSizes: { source: 'ISO 3630-1', label: 'memory' },
  tipDiameter: { source: 'ISO 3630-1; ANSI/ADA Specification No. 28', label: 'memory' },
  standardTaper: { source: 'ANSI/ADA Specification No. 28', label: 'memory' },
  colours: { source: 'ISO 3630-1', label: 'memory' },
  nonStandard: { source: 'ISO 6877', label: 'memory' },
} as const satisfies Record<string, Sourced>;

/** ISO sizes as written: 06, 08, 10, 15–60 by 5, 70–140 by 10 (ISO 3630-1 — memory). */
export const ISO_SIZES: readonly string[] = Object.freeze([
  '06',
  '08',
  '10',
  ...range(15, 60, 5).map(String),
  ...range(70, 140, 10).map(String),
]);

/**
 * Non-standardised accessory cone and spreader designations, set by ISO 6877 (memory). Their
 * tapers vary by maker (team's knowledge — memory); the rules compare designations only.
 */
export const NON_STANDARD_SIZES: readonly string[] = Object.freeze(['XF', 'FF', 'MF', 'F', 'FM', 'M', 'ML', 'L', 'XL']);

/** Human-readable list used in messages. */
export const SIZE_RULE_TEXT =
  'an ISO size (06, 08, 10, 15–60 by 5, 70–140 by 10) or one of XF, FF, MF, F, FM, M, ML, L, XL';

const isoSet = new Set(ISO_SIZES);
const nonStandardSet = new Set(NON_STANDARD_SIZES);

function range(from: number, to: number, step: number): number[] {
  const out: number[] = [];
  for (let v = from; v <= to; v += step) out.push(v);
  return out;
}

/** True for an ISO size written as the contract writes it ("06", "35", "140"). */
export function isIsoSize(s: string): boolean {
  return typeof s === 'string' && isoSet.has(s);
}

/** True for an ISO size or a non-standardised designation. */
export function isConeSize(s: string): boolean {
  return isIsoSize(s) || (typeof s === 'string' && nonStandardSet.has(s));
}

/**
 * Reads a size the way the sync contract does, or null when it is not one.
 * - A number is read as the ISO size it names: 35 → "35", and 6 → "06", 8 → "08" (a JSON
 *   number cannot carry the leading zero, so this is the only reading it can have).
 * - A string must be written as the contract writes it: "06" (not "6"), "35", "MF".
 *   Designations are case-sensitive ("mf" → null), as the contract lists them in capitals.
 * - Surrounding blanks are not trimmed: sizes come from chips, not from typing.
 */
export function normaliseSize(v: unknown): string | null {
  if (typeof v === 'number') {
    if (!Number.isInteger(v)) return null;
    const s = v < 10 && v >= 0 ? `0${v}` : String(v);
    return isIsoSize(s) ? s : null;
  }
  if (typeof v === 'string') return isConeSize(v) ? v : null;
  return null;
}

export type IsoColourName = 'pink' | 'grey' | 'purple' | 'white' | 'yellow' | 'red' | 'blue' | 'green' | 'black';

// hex is our rendering of each colour; textHex is black or white, whichever gives a WCAG AA
// contrast (≥ 4.5:1) on it — checked by a test.
const COLOURS: Record<IsoColourName, { hex: string; textHex: string }> = {
  pink: { hex: '#F4A6C3', textHex: '#000000' },
  grey: { hex: '#9E9E9E', textHex: '#000000' },
  purple: { hex: '#6A3D9A', textHex: '#FFFFFF' },
  white: { hex: '#FFFFFF', textHex: '#000000' },
  yellow: { hex: '#FFD500', textHex: '#000000' },
  red: { hex: '#C62828', textHex: '#FFFFFF' },
  blue: { hex: '#1F5BB8', textHex: '#FFFFFF' },
  green: { hex: '#2E7D32', textHex: '#FFFFFF' },
  black: { hex: '#000000', textHex: '#FFFFFF' },
};

// From 15: white, yellow, red, blue, green, black, repeating for 45–80 and 90–140;
// 06 pink, 08 grey, 10 purple (ISO 3630-1 — memory).
const CYCLE: readonly IsoColourName[] = ['white', 'yellow', 'red', 'blue', 'green', 'black'];

/** The ISO colour code of a size; null for designations and anything that is not an ISO size. */
export function isoColour(size: string): { name: IsoColourName; hex: string; textHex: string } | null {
  if (!isIsoSize(size)) return null;
  let name: IsoColourName;
  if (size === '06') name = 'pink';
  else if (size === '08') name = 'grey';
  else if (size === '10') name = 'purple';
  else {
    const i = ISO_SIZES.indexOf(size) - 3; // 15 is the fourth size
    name = CYCLE[i % CYCLE.length] as IsoColourName;
  }
  return { name, ...COLOURS[name] };
}

/**
 * Tip diameter D0 in mm: the ISO size in hundredths of a millimetre (size 30 → 0.30 mm;
 * ISO 3630-1, ANSI/ADA Specification No. 28 — memory). NaN for a designation.
 */
export function tipDiameterMm(size: string): number {
  return isIsoSize(size) ? Number(size) / 100 : Number.NaN;
}

/**
 * Diameter at a distance from the tip for a given taper (default the standard 0.02 mm/mm,
 * ANSI/ADA Specification No. 28 — memory):
 * D = D0 + taper × distance, e.g. size 30 at 16 mm → 0.62 mm. NaN for a designation or a
 * distance or taper that is negative or not finite. Rounded to 0.001 mm to drop float noise.
 */
export function diameterAtMm(size: string, mmFromTip: number, taper = 0.02): number {
  const d0 = tipDiameterMm(size);
  if (!Number.isFinite(mmFromTip) || mmFromTip < 0 || !Number.isFinite(taper) || taper < 0) return Number.NaN;
  return Math.round((d0 + taper * mmFromTip) * 1000) / 1000;
}
