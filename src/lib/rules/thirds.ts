// Canal thirds and when lateral compaction is complete (docs/rules.md, "Canal thirds").
import { averageLengthMm } from './anatomy';
import { CONELINE, type Sourced } from './labels';
import { isValidFdi, toothGroup } from './teeth';
import { DEFAULT_TOLERANCES } from './tolerances';

/**
 * The tooth length the fallback stop depth's 10–12 mm rule of thumb is taken to be made for:
 * 21 mm, the middle of the 20–22.5 mm most tooth types in the average table fall within
 * (molars 21, premolars 22.25–22.5, mandibular incisors 20.7–21.1) — the "most teeth" the
 * rule speaks of — and the average the table gives the molars, where the rule is chiefly
 * taught, so a molar's estimate is unchanged. Our judgement.
 */
export const STOP_DEPTH_REFERENCE_LENGTH_MM = 21;
export const STOP_DEPTH_SCALING_SOURCE: Sourced = { source: CONELINE, label: 'judgement' };

/**
 * The fallback stop depth for a tooth: s itself, except for a permanent anterior tooth
 * (FDI x1–x3) with an average length A, where it is s × A / 21 (judgement: a long canine's
 * coronal third ends deeper than a short incisor's). Example: s = 12 on a maxillary canine
 * (27 mm) → 15.43 mm; on a mandibular central incisor (20.7 mm) → 11.83 mm.
 */
export function fallbackStopDepthFor(tooth: number | undefined, s: number): number {
  if (tooth === undefined || !isValidFdi(tooth) || !toothGroup(tooth).anterior) return s;
  const avg = averageLengthMm(tooth);
  return avg === null ? s : (s * avg) / STOP_DEPTH_REFERENCE_LENGTH_MM;
}

/** Estimating the orifice from the fallback stop depth, o = (3s − CWL) / 2, is our judgement. */
export const ORIFICE_ESTIMATE_SOURCE: Sourced = { source: CONELINE, label: 'judgement' };

export interface CanalThirds {
  /** Orifice depth o from the reference point. */
  orificeMm: number;
  /** End of the coronal third, o + L/3, where L = CWL − o. */
  coronalEndMm: number;
  /** End of the middle third, o + 2L/3. */
  middleEndMm: number;
  cwlMm: number;
  /** True when o was estimated from the fallback stop depth, not recorded. */
  estimated: boolean;
}

/**
 * The thirds of a canal from its orifice to the CWL. With no recorded orifice depth, o is
 * estimated so that the coronal third ends at the fallback stop depth s for the tooth
 * (`fallbackStopDepthFor`: on an anterior tooth s × average length / 21, judgement):
 * o = (3s − CWL) / 2, kept within [0, CWL / 2] — for a CWL of 21 mm and s = 12, o = 7.5 mm.
 * A recorded depth is kept within [0, CWL] (a CWL corrected to above the orifice leaves no
 * canal to divide; the thirds then collapse onto the CWL rather than run backwards).
 */
export function canalThirds(
  cwlMm: number,
  orificeDepthMm: number | undefined,
  fallbackStopDepthMm: number = DEFAULT_TOLERANCES.fallbackStopDepthMm,
  tooth?: number,
): CanalThirds {
  const cwl = Number.isFinite(cwlMm) && cwlMm > 0 ? cwlMm : 0;
  const s0 = Number.isFinite(fallbackStopDepthMm) ? fallbackStopDepthMm : DEFAULT_TOLERANCES.fallbackStopDepthMm;
  const s = fallbackStopDepthFor(tooth, s0);
  const estimated = orificeDepthMm === undefined || !Number.isFinite(orificeDepthMm);
  const o = estimated ? clamp((3 * s - cwl) / 2, 0, cwl / 2) : clamp(orificeDepthMm, 0, cwl);
  const l = cwl - o;
  return { orificeMm: o, coronalEndMm: o + l / 3, middleEndMm: o + (2 * l) / 3, cwlMm: cwl, estimated };
}

function clamp(v: number, lo: number, hi: number): number {
  return Math.min(hi, Math.max(lo, v));
}

/** Compaction is complete once the latest spreader depth is at most o + L/3. */
export function isCompactionComplete(latestSpreaderDepthMm: number | undefined, thirds: CanalThirds): boolean {
  return latestSpreaderDepthMm !== undefined && latestSpreaderDepthMm <= thirds.coronalEndMm + 1e-9;
}
