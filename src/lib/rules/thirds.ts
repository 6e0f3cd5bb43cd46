// Canal thirds and when lateral compaction is complete (docs/rules.md, "Canal thirds").
import { DEFAULT_TOLERANCES } from './tolerances';

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
 * estimated so that the coronal third ends at the fallback stop depth s:
 * o = (3s − CWL) / 2, kept within [0, CWL / 2] — for a CWL of 21 mm and s = 12, o = 7.5 mm.
 * A recorded depth is kept within [0, CWL] (a CWL corrected to above the orifice leaves no
 * canal to divide; the thirds then collapse onto the CWL rather than run backwards).
 */
export function canalThirds(
  cwlMm: number,
  orificeDepthMm: number | undefined,
  fallbackStopDepthMm: number = DEFAULT_TOLERANCES.fallbackStopDepthMm,
): CanalThirds {
  const cwl = Number.isFinite(cwlMm) && cwlMm > 0 ? cwlMm : 0;
  const s = Number.isFinite(fallbackStopDepthMm) ? fallbackStopDepthMm : DEFAULT_TOLERANCES.fallbackStopDepthMm;
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
