// Tolerances a course director may change. Defaults are the trade's usual values; the
// source of each (labels from docs/references.md) and any disagreement is written beside it.

export interface Tolerances {
  cwlUnusualMarginMm: number;
  taperShortMarginMm: number;
  masterLengthMarginMm: number;
  coneFitRetakeThresholdMm: number;
  firstSpreaderMarginMm: number;
  accessoryLengthMarginMm: number;
  minAccessoryCones: number;
  fallbackStopDepthMm: number;
  fillShortLimitMm: number;
}

/** Where each default comes from, shown on the reference page. */
export const TOLERANCE_SOURCES: Record<keyof Tolerances, string> = {
  cwlUnusualMarginMm:
    'Judgement: tooth lengths serve only as a soft note with wide bounds; the published averages differ by up to 2 mm between sources (mandibular central incisor 20.7 or 21.5 mm, lateral up to 23 mm).',
  taperShortMarginMm:
    'Trade teaching (practice): the spreader reaches within 1 mm of the CWL; agrees with Allison, Weber & Walton, J Endod 1979 (seen) for step-back preparations, which found 2 mm or less enough in standardised ones: a disagreement, the stricter value is the default.',
  masterLengthMarginMm:
    'Trade teaching (practice): the master cone goes to the full CWL. One source seats it 0.5 mm short and a size larger: a disagreement; a 0.5 mm margin (one ruler step) accepts that practice.',
  coneFitRetakeThresholdMm:
    'Trade teaching (practice): retake the cone-fit radiograph when the cone is changed by 1 mm or more.',
  firstSpreaderMarginMm: 'Trade teaching (practice): the first spreader placement reaches within 2 mm of the CWL.',
  accessoryLengthMarginMm:
    'Trade teaching (practice): each accessory cone is measured to the depth the spreader reached; the 0.5 mm margin is one ruler step (our judgement).',
  minAccessoryCones:
    'Trade teaching (practice): usually 4–5 accessory cones in an average canal, more in wide ones; 3 is the floor below which a note is shown, as narrow canals take fewer (our judgement).',
  fallbackStopDepthMm:
    'Trade teaching (practice): stop when the spreader no longer passes the coronal third, about 10–12 mm from a cusp reference in most teeth; the upper end is the default.',
  fillShortLimitMm:
    "European Society of Endodontology quality guidelines, Int Endod J 2006 (seen, secondary); Jurič et al., Int Endod J 2024 (seen): a fill more than 2 mm short of the radiographic apex is under-filled. The contract's fill categories are drawn at this limit.",
};

export const DEFAULT_TOLERANCES: Tolerances = Object.freeze({
  cwlUnusualMarginMm: 4, // judgement; sources of tooth lengths differ (see TOLERANCE_SOURCES)
  taperShortMarginMm: 1.0, // practice; Allison 1979: 1 mm (step-back) vs 2 mm (standardised)
  masterLengthMarginMm: 0.5, // practice; one source seats 0.5 mm short, a size larger
  coneFitRetakeThresholdMm: 1.0, // practice
  firstSpreaderMarginMm: 2.0, // practice
  accessoryLengthMarginMm: 0.5, // practice; one ruler step
  minAccessoryCones: 3, // practice says 4–5 usual; 3 is our floor for a note
  fallbackStopDepthMm: 12, // practice: 10–12 mm from a cusp tip
  fillShortLimitMm: 2, // ESE 2006 (seen, secondary); Jurič 2024 (seen)
});

/**
 * The range a director may set each tolerance within (inclusive). Our judgement: wide enough
 * for every value the sources above disagree on, narrow enough that a slip of the keyboard
 * (20 for 2.0) cannot switch a check off. Every default lies inside its range.
 */
export const TOLERANCE_RANGES: Readonly<Record<keyof Tolerances, { min: number; max: number }>> = Object.freeze({
  cwlUnusualMarginMm: { min: 1, max: 10 },
  taperShortMarginMm: { min: 0, max: 3 },
  masterLengthMarginMm: { min: 0, max: 2 },
  coneFitRetakeThresholdMm: { min: 0.5, max: 3 },
  firstSpreaderMarginMm: { min: 0.5, max: 5 },
  accessoryLengthMarginMm: { min: 0, max: 2 },
  minAccessoryCones: { min: 0, max: 10 },
  fallbackStopDepthMm: { min: 8, max: 16 },
  fillShortLimitMm: { min: 0.5, max: 3 },
});

/** Whether `value` is a number a director may set `key` to (finite, within its range). */
export function toleranceInRange(key: keyof Tolerances, value: unknown): value is number {
  const r = TOLERANCE_RANGES[key];
  return typeof value === 'number' && Number.isFinite(value) && value >= r.min && value <= r.max;
}

/** Fills in defaults; a value that is not a finite, non-negative number falls back to its default. */
export function resolveTolerances(partial?: Partial<Tolerances> | null): Tolerances {
  const out: Tolerances = { ...DEFAULT_TOLERANCES };
  if (partial === null || typeof partial !== 'object') return out;
  for (const key of Object.keys(DEFAULT_TOLERANCES) as (keyof Tolerances)[]) {
    const v: unknown = (partial as Record<string, unknown>)[key];
    if (typeof v === 'number' && Number.isFinite(v) && v >= 0) out[key] = v;
  }
  return out;
}
