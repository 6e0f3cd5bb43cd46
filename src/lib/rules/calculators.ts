// Chairside calculators. Sources and labels from docs/references.md. Invalid input gives NaN (or
// an empty schedule) rather than an exception, so a half-typed form never breaks a screen.
import { CONELINE, type Sourced } from './labels';
import { ISO_SIZES, diameterAtMm, isIsoSize, isoColour, tipDiameterMm, type IsoColourName } from './sizes';

/** Rounds to 0.01 mm, dropping float noise (22.727… → 22.73). */
export function roundToHundredth(mm: number): number {
  return Math.round((mm + Number.EPSILON) * 100) / 100;
}

/** Rounds to the nearest 0.5 mm, the step of every length Coneline records. */
export function roundToHalf(mm: number): number {
  return Math.round(mm * 2) / 2;
}

/**
 * Rounds down to the 0.5 mm ruler step, so a derived working length is never longer than
 * computed (our judgement: short of the apex is the safer side). The value is first taken to
 * 0.01 mm, the resolution every calculator reports, which also drops float noise: 22.73 → 22.5,
 * 22.999999 → 23.0 (shown beside it as 23.00, so the two never disagree), 22.99 → 22.5.
 * NaN for anything that is not a finite number.
 */
export function floorToHalf(mm: number): number {
  if (typeof mm !== 'number' || !Number.isFinite(mm)) return Number.NaN;
  // Hundredths as an integer: 2273 → 4 whole half-millimetres (50 hundredths each) → 22.5.
  const hundredths = Math.round(roundToHundredth(mm) * 100);
  return (Math.floor(hundredths / 50) * 50) / 100;
}

/** Rounding every derived length down (floorToHalf) is our judgement. */
export const FLOOR_TO_HALF_SOURCE: Sourced = { source: CONELINE, label: 'judgement' };

/** What the radiograph shows around the apex, which sets how far short the working length is. */
export type Resorption = 'none' | 'bone' | 'bone-and-root';
export const RESORPTIONS: readonly Resorption[] = Object.freeze(['none', 'bone', 'bone-and-root']);
/** How far short of the actual length the working length is, by resorption (DISCREPANCY_SOURCE). */
export const RESORPTION_ALLOWANCE_MM: Readonly<Record<Resorption, number>> = Object.freeze({
  none: 1,
  bone: 1.5,
  'bone-and-root': 2,
});
/** The radiographic (discrepancy) method and its allowances. */
export const DISCREPANCY_SOURCE: Sourced = {
  source: "Ingle; Weine; Grossman's Endodontic Practice, 13th ed. (secondary pages)",
  label: 'seen',
};

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
  resorption: Resorption = 'none',
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

/** How far short of an apex locator's reading the working length is, mm (APEX_LOCATOR_SOURCE). */
export const APEX_LOCATOR_BACK_OFF_MM: Readonly<{ min: number; max: number }> = Object.freeze({ min: 0.5, max: 1.0 });
export const APEX_LOCATOR_SOURCE: Sourced = { source: 'Jung et al., J Endod; BioMed Res Int 2020', label: 'seen' };

/**
 * Working length from an electronic apex locator reading: 0.5–1.0 mm short of the reading
 * (Jung et al., J Endod; BioMed Res Int 2020 — seen). The back-off defaults to 0.5 mm; NaN
 * when it is outside 0.5–1.0 or the reading is not a positive length.
 */
export function workingLengthFromApexLocator(readingMm: number, backOffMm = APEX_LOCATOR_BACK_OFF_MM.min): number {
  if (!(readingMm > 0) || !Number.isFinite(readingMm)) return Number.NaN;
  if (!(backOffMm >= APEX_LOCATOR_BACK_OFF_MM.min && backOffMm <= APEX_LOCATOR_BACK_OFF_MM.max)) return Number.NaN;
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

/** Taking the radiographic method's allowance off the proportional method's length is our judgement. */
export const PROPORTIONAL_ALLOWANCE_SOURCE: Sourced = { source: CONELINE, label: 'judgement' };

/**
 * Working length by the proportional method: the tooth length from `proportionalLength`
 * (Grossman's formula — seen, secondary) less the radiographic method's allowance (1 mm, 1.5 mm
 * with bone resorption, 2 mm with bone and root resorption — seen for that method; using it
 * after the proportional estimate too is our judgement). Example: 20.0 × 25.0 ÷ 22.0 = 22.73 mm
 * → working length 21.73 mm. NaN unless all three lengths are positive.
 */
export function workingLengthByProportion(
  actualFileMm: number,
  radiographicToothMm: number,
  radiographicFileMm: number,
  resorption: Resorption = 'none',
): { actualLengthMm: number; workingLengthMm: number } {
  const actual = proportionalLength(actualFileMm, radiographicToothMm, radiographicFileMm);
  const allowance = RESORPTION_ALLOWANCE_MM[resorption];
  if (Number.isNaN(actual) || allowance === undefined) {
    return { actualLengthMm: Number.NaN, workingLengthMm: Number.NaN };
  }
  return { actualLengthMm: actual, workingLengthMm: roundToHundredth(actual - allowance) };
}

/** The allowance each resorption choice takes off the actual length (mm). */
export function resorptionAllowanceMm(resorption: Resorption): number {
  return RESORPTION_ALLOWANCE_MM[resorption] ?? Number.NaN;
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

/**
 * Length of the cutting part over which an ISO instrument's 0.02 taper runs, so the diameter
 * 16 mm from the tip is D16 = D0 + 0.32 mm (SIZE_SOURCES.standardTaper; D16 is
 * arithmetic).
 */
export const ISO_CUTTING_LENGTH_MM = 16;

export interface IsoSizeRow {
  size: string;
  colour: IsoColourName;
  hex: string;
  textHex: string;
  /** Tip diameter, mm. */
  d0Mm: number;
  /** Diameter at 16 mm from the tip with the standard 0.02 taper, mm. */
  d16Mm: number;
}

/** One ISO size with its colour and diameters (size 30 → blue, D0 0.30 mm, D16 0.62 mm); null for a designation. */
export function isoSizeRow(size: string): IsoSizeRow | null {
  const colour = isoColour(size);
  if (!colour) return null;
  return {
    size,
    colour: colour.name,
    hex: colour.hex,
    textHex: colour.textHex,
    d0Mm: tipDiameterMm(size),
    d16Mm: diameterAtMm(size, ISO_CUTTING_LENGTH_MM),
  };
}
