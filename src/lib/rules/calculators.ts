// Chairside calculators. Sources and labels from docs/references.md. Invalid input gives NaN (or
// an empty schedule) rather than an exception, so a half-typed form never breaks a screen.
import type { Sourced } from './labels';
import { ISO_SIZES, isIsoSize } from './sizes';

/** Rounds to 0.01 mm, dropping float noise (22.727… → 22.73). */
export function roundToHundredth(mm: number): number {
  return Math.round((mm + Number.EPSILON) * 100) / 100;
}

/** Rounds to the nearest 0.5 mm, the step of every length Coneline records. */
export function roundToHalf(mm: number): number {
  return Math.round(mm * 2) / 2;
}

const RESORPTION_ALLOWANCE_MM = { none: 1, bone: 1.5, 'bone-and-root': 2 } as const;

/**
 * Radiographic (discrepancy) method — Ingle; Weine; Grossman's Endodontic Practice, 13th ed.
 * (secondary pages) — seen: actual length = file length + distance from the file tip to the
 * radiographic apex (positive when the file is short of the apex, negative when beyond);
 * working length = actual − 1 mm, − 1.5 mm with bone resorption, − 2 mm with bone and root
 * resorption. Example: file at 22.0 mm, tip 2.0 mm short → 24.0 mm → working length 23.0 mm.
 */
export function workingLengthByDiscrepancy(
  fileLengthMm: number,
  tipToApexMm: number,
  resorption: 'none' | 'bone' | 'bone-and-root' = 'none',
): { actualLengthMm: number; workingLengthMm: number } {
  const allowance = RESORPTION_ALLOWANCE_MM[resorption];
  if (
    !(fileLengthMm > 0) ||
    !Number.isFinite(fileLengthMm) ||
    !Number.isFinite(tipToApexMm) ||
    allowance === undefined
  ) {
    return { actualLengthMm: Number.NaN, workingLengthMm: Number.NaN };
  }
  const actual = fileLengthMm + tipToApexMm;
  return { actualLengthMm: roundToHundredth(actual), workingLengthMm: roundToHundredth(actual - allowance) };
}

/**
 * Working length from an electronic apex locator reading: 0.5–1.0 mm short of the reading
 * (Jung et al., J Endod; BioMed Res Int 2020 — seen). The back-off defaults to 0.5 mm; NaN
 * when it is outside 0.5–1.0 or the reading is not a positive length.
 */
export function workingLengthFromApexLocator(readingMm: number, backOffMm = 0.5): number {
  if (!(readingMm > 0) || !Number.isFinite(readingMm)) return Number.NaN;
  if (!(backOffMm >= 0.5 && backOffMm <= 1.0)) return Number.NaN;
  return roundToHundredth(readingMm - backOffMm);
}

/** The proportional formula is Grossman's, read in secondary pages quoting it. */
export const PROPORTIONAL_SOURCE: Sourced = {
  source: "Grossman's formula, Grossman's Endodontic Practice",
  label: 'seen (secondary)',
};

/** Mullaney's step of 1.0 mm per size, and the 0.5 mm step Allison et al. used. */
export const STEP_BACK_SOURCES: Readonly<Record<'1.0' | '0.5', Sourced>> = {
  '1.0': { source: 'Mullaney, Dent Clin North Am 1979;23(4):575–92', label: 'seen' },
  '0.5': { source: 'Allison, Weber & Walton, J Endod 1979;5(10):298–304', label: 'seen' },
};

/**
 * Proportional method — Grossman's formula (Grossman's Endodontic Practice, seen in secondary
 * pages): actual length = actual file length × radiographic tooth length ÷ radiographic file
 * length, rounded to 0.01 mm.
 * Example: 20.0 × 25.0 ÷ 22.0 = 22.73 mm. NaN unless all three are positive.
 */
export function proportionalLength(
  actualFileMm: number,
  radiographicToothMm: number,
  radiographicFileMm: number,
): number {
  const all = [actualFileMm, radiographicToothMm, radiographicFileMm];
  if (!all.every((v) => Number.isFinite(v) && v > 0)) return Number.NaN;
  return roundToHundredth((actualFileMm * radiographicToothMm) / radiographicFileMm);
}

/**
 * Step-back schedule after the MAF: each next larger ISO file is shortened by the step
 * (Mullaney, Dent Clin North Am 1979 — seen: MAF 25, then 30, 35, 40 at 1, 2, 3 mm short;
 * 0.5 mm per size in Allison, Weber & Walton, J Endod 1979 — seen: sources differ). The MAF itself (at the CWL, used to
 * recapitulate) is not listed. Stops early at size 140 or before a length under 0.5 mm;
 * [] for a MAF that is not an ISO size, a step other than 0.5 or 1.0, or an invalid CWL.
 */
export function stepBackSchedule(
  mafSize: string,
  cwlMm: number,
  stepMm: 0.5 | 1.0,
  count = 3,
): { size: string; lengthMm: number }[] {
  if (!isIsoSize(mafSize) || (stepMm !== 0.5 && stepMm !== 1.0)) return [];
  if (!Number.isFinite(cwlMm) || cwlMm <= 0 || !Number.isInteger(count) || count < 0) return [];
  const start = ISO_SIZES.indexOf(mafSize);
  const out: { size: string; lengthMm: number }[] = [];
  for (let i = 1; i <= count; i++) {
    const size = ISO_SIZES[start + i];
    const lengthMm = roundToHundredth(cwlMm - i * stepMm);
    if (size === undefined || lengthMm < 0.5) break;
    out.push({ size, lengthMm });
  }
  return out;
}
