// Tolerances a course director may change. Defaults are the trade's usual values; the
// source of each (labels from docs/references.md) and any disagreement is written beside it.
import { CONELINE, TRADE_TEACHING, type Sourced } from './labels';

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
  /** 1: the attending approves each canal's cone fit before it is sealed (`cone-fit-not-approved`); 0: no such check. */
  requireConeFitApproval: number;
}

/**
 * Where each default comes from and how sure we are of it (docs/references.md, "Values in the
 * code"; tests/lib/rules/reference-labels.test.ts holds the two together).
 */
export const TOLERANCE_LABELS: Readonly<Record<keyof Tolerances, Sourced>> = {
  cwlUnusualMarginMm: { source: CONELINE, label: 'judgement' },
  taperShortMarginMm: { source: TRADE_TEACHING, label: 'practice' },
  masterLengthMarginMm: { source: TRADE_TEACHING, label: 'practice' },
  coneFitRetakeThresholdMm: { source: TRADE_TEACHING, label: 'practice' },
  firstSpreaderMarginMm: { source: TRADE_TEACHING, label: 'practice' },
  accessoryLengthMarginMm: { source: CONELINE, label: 'judgement' },
  minAccessoryCones: { source: CONELINE, label: 'judgement' },
  fallbackStopDepthMm: { source: TRADE_TEACHING, label: 'practice' },
  fillShortLimitMm: {
    source:
      'Jurič et al., Int Endod J 2024; European Society of Endodontology quality guidelines, Int Endod J 2006;39:921–930',
    label: 'seen',
  },
  requireConeFitApproval: { source: CONELINE, label: 'judgement' },
};

const ALLISON = 'Allison, Weber & Walton, J Endod 1979;5(10):298–304 (seen)';

// What each default means and where sources disagree, after its source and label.
const NOTES: Readonly<Record<keyof Tolerances, string>> = {
  cwlUnusualMarginMm:
    'tooth lengths serve only as a soft note with wide bounds; the averages differ by up to 2 mm between texts (mandibular central incisor 20.7 or 21.5 mm, lateral 21.1 or up to 23 mm, all memory).',
  taperShortMarginMm: `the spreader reaches within 1 mm of the CWL before obturation. ${ALLISON} found no significant leakage with the spreader within 1 mm of the working length in step-back preparations, and within 2 mm or less in standardised ones: a disagreement; the default takes the stricter step-back 1 mm.`,
  masterLengthMarginMm:
    'the master cone goes to the full CWL. Some teaching fits it 0.5 mm short and a size larger (practice, no published source named): a disagreement; the 0.5 mm margin, one ruler step, accepts that practice.',
  coneFitRetakeThresholdMm: 'retake the cone-fit radiograph when the cone is changed by 1 mm or more.',
  firstSpreaderMarginMm: `the first spreader placement reaches within 2 mm of the CWL. ${ALLISON} support 2 mm only in standardised preparations; in step-back ones they found 1 mm needed. The default takes the standardised 2 mm, as the trade teaches, for every preparation; a director who wants the step-back figure sets 1.0.`,
  accessoryLengthMarginMm:
    'each accessory cone is measured to the depth the spreader reached (trade teaching, practice); the 0.5 mm margin is one ruler step.',
  minAccessoryCones:
    'usually 4–5 accessory cones in an average canal, more in wide ones (trade teaching, practice); 3 is the floor below which a note is shown, as narrow canals take fewer.',
  fallbackStopDepthMm:
    "stop when the spreader no longer passes the coronal third, about 10–12 mm from a cusp reference in most teeth; the upper end is the default. On an anterior tooth it is scaled by the tooth type's average length, s × A / 21 (judgement; see Canal thirds).",
  fillShortLimitMm:
    "a fill more than 2 mm short of the radiographic apex is under-filled (the guidelines seen through their abstract and secondary tables). The contract's fill categories are drawn at this limit.",
  requireConeFitApproval:
    "a switch, not a length: 1 has the attending approve each canal's cone fit (at the chair or from the review queue) before the master cone is seated with sealer; 0, the default, leaves it to the school's own routine. A school's protocol, not a fact of the trade.",
};

/** "Trade teaching (practice): …": a source, its label and the note, as the reference page shows it. */
export function sourceLine(s: Sourced, note: string): string {
  const label = s.label.replace(' (', ', ').replace(')', '');
  return `${s.source.charAt(0).toUpperCase()}${s.source.slice(1)} (${label}): ${note}`;
}

function toleranceSources(): Readonly<Record<keyof Tolerances, string>> {
  return Object.freeze(
    Object.fromEntries(
      (Object.keys(TOLERANCE_LABELS) as (keyof Tolerances)[]).map((k) => [
        k,
        sourceLine(TOLERANCE_LABELS[k], NOTES[k]),
      ]),
    ) as Record<keyof Tolerances, string>,
  );
}

/**
 * Where each default comes from, shown on the reference page. Built by one pure call, so a
 * bundle that never reads it (the tablet's) leaves the notes out.
 */
export const TOLERANCE_SOURCES: Readonly<Record<keyof Tolerances, string>> = /* @__PURE__ */ toleranceSources();

export const DEFAULT_TOLERANCES: Tolerances = Object.freeze({
  cwlUnusualMarginMm: 4, // judgement; remembered tooth lengths differ by up to 2 mm
  taperShortMarginMm: 1.0, // practice; Allison 1979 (seen): 1 mm step-back, 2 mm standardised — step-back taken
  masterLengthMarginMm: 0.5, // practice; some teaching fits 0.5 mm short (practice, no source named)
  coneFitRetakeThresholdMm: 1.0, // practice
  firstSpreaderMarginMm: 2.0, // practice; Allison 1979 (seen) supports 2 mm for standardised canals only — taken
  accessoryLengthMarginMm: 0.5, // judgement: one ruler step
  minAccessoryCones: 3, // judgement: practice says 4–5 usual; 3 is our floor for a note
  fallbackStopDepthMm: 12, // practice: 10–12 mm from a cusp tip
  fillShortLimitMm: 2, // Jurič 2024 (seen); ESE 2006 (abstract seen)
  requireConeFitApproval: 0, // judgement: off unless the school's protocol asks for it
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
  requireConeFitApproval: { min: 0, max: 1 },
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
