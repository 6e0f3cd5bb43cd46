// The catalogue of findings (docs/rules.md is rendered from it): for each code, what raises it, its source and its
// tolerance; the severities are in severities.ts. The reference page (docs/rules.md) and the
// tests read it; the chairside island raises findings without it.
import { SEVERITY, type FindingCode, type Severity } from './severities';
import type { Tolerances } from './tolerances';

export type { Severity, FindingCode, Finding } from './severities';

export interface FindingInfo {
  severity: Severity;
  title: string;
  raisedWhen: string;
  source: string;
  tolerance?: keyof Tolerances;
}

export const SAFETY_LINE =
  "Coneline records and checks lengths; clinical decisions rest with you, your attending and your school's protocol.";

const PRACTICE = 'Trade teaching (practice)';

/** What raises each finding and its source. "Tooth:" marks rules that do not apply to a training block. */
const CATALOGUE: Record<FindingCode, Omit<FindingInfo, 'severity'>> = {
  'cwl-unusual-for-tooth': {
    title: 'CWL unusual for the tooth',
    tolerance: 'cwlUnusualMarginMm',
    raisedWhen:
      "Tooth: the CWL differs from the average length of that tooth type (a range's midpoint) by more than the margin; no note where the table has no value for the tooth.",
    source:
      "Average lengths, each with its source in references.md: Grossman's Endodontic Practice 2020, table 13.2 (seen) for the maxillary incisors, canine and first premolar; PMC4195450 (seen) for the mandibular first premolar; Wheeler's Dental Anatomy, Physiology and Occlusion (memory: crown + root length) for the mandibular canine and the second premolars; the team's knowledge (memory) for the mandibular incisors and the molars.",
  },
  'cwl-corrected-without-reason': {
    title: 'CWL corrected with no reason',
    raisedWhen: 'The CWL in use was set by a correction recorded with an empty reason.',
    source: `${PRACTICE}: a change of working length is explained on the record (a new radiograph, an apex-locator reading, lost length).`,
  },
  'seat-not-confirmed': {
    title: 'MAF seat not confirmed',
    raisedWhen:
      'At the tap: the latest seat check (the latest before the master cone was seated, once it is) was not at the CWL, or the MAF advanced past it or did not reach; a later passing check clears it. Also when the master cone is seated with no seat check before it.',
    source: `${PRACTICE}: the MAF seats at the CWL and does not advance under light apical pressure.`,
  },
  'seat-file-not-maf': {
    title: 'Seat checked with another file size',
    raisedWhen:
      "The seat check judged for the canal (the latest before the master cone was seated, or the latest of all before seating) used a file whose size is not the MAF's.",
    source: `${PRACTICE}: the seat of the apical preparation is checked with the MAF itself.`,
  },
  'taper-not-checked': {
    title: 'Taper not checked',
    raisedWhen: 'The master cone is seated with no taper check recorded before it.',
    source: `${PRACTICE}: the spreader reaches within 1 mm of the CWL before obturation; agrees with Allison, Weber & Walton, J Endod 1979 (seen) for step-back preparations.`,
  },
  'taper-short': {
    title: 'Taper check short',
    tolerance: 'taperShortMarginMm',
    raisedWhen:
      'The taper-check spreader (the latest check before the master cone was seated) stopped more than the margin short of the CWL.',
    source: `${PRACTICE}; Allison, Weber & Walton, J Endod 1979 (seen): within 1 mm in step-back preparations, 2 mm or less in standardised ones; the default takes the stricter 1 mm.`,
  },
  'taper-beyond-cwl': {
    title: 'Taper check past the CWL',
    raisedWhen:
      'The taper-check spreader judged for the canal (the latest before seating, or the latest of all before seating) went deeper than the CWL, at the tap.',
    source: `${PRACTICE}: a spreader that passes the CWL at the taper check suggests the apical stop may be lost; the seat is checked again.`,
  },
  'maf-radiograph-missing': {
    title: 'MAF radiograph missing',
    raisedWhen: 'Tooth: the master cone is seated with no MAF radiograph recorded.',
    source: `${PRACTICE}: radiograph the MAF in place on teeth and patients.`,
  },
  'final-rinse-incomplete': {
    title: 'Final rinse incomplete',
    raisedWhen:
      'The master cone is seated, and the rinses recorded before it (together, over one or more rinse steps) do not include both sodium hypochlorite and EDTA.',
    source:
      'Grande et al., J Endod; Silveira et al., J Microsc Ultrastruct 2013 (seen): sodium hypochlorite then 17 % EDTA removes the smear layer.',
  },
  'paper-point-long': {
    title: 'Paper point longer than the CWL',
    raisedWhen: 'A paper point was measured longer than the CWL.',
    source: `${PRACTICE}: paper points are measured so they cannot pass the CWL.`,
  },
  'master-size-mismatch': {
    title: 'Master cone size differs from the MAF',
    raisedWhen: "The master cone's size (the latest fit) differs from the MAF's.",
    source: `${PRACTICE}: same ISO size as the MAF (some teaching fits a size larger: practice, no published source named; a disagreement).`,
  },
  'master-length-mismatch': {
    title: 'Master cone not at length',
    tolerance: 'masterLengthMarginMm',
    raisedWhen:
      'The fitted master cone (the latest fit) did not reach, or was measured shorter than the CWL by more than the margin (a cone past the CWL raises `master-beyond-cwl`).',
    source: `${PRACTICE}: the master cone goes to the full CWL (some teaching fits it 0.5 mm short: practice, no published source named; a disagreement).`,
  },
  'master-beyond-cwl': {
    title: 'Master cone past the CWL',
    raisedWhen:
      'The fitted master cone (the latest fit) was measured to a length greater than the CWL, by any amount, at the tap. A cone short of the CWL by more than the margin stays `master-length-mismatch`.',
    source: `${PRACTICE}: the master cone never goes past the CWL; a cone past it risks extruding gutta-percha and sealer.`,
  },
  'cone-fit-radiograph-missing': {
    title: 'Cone-fit radiograph missing',
    raisedWhen:
      'Tooth: the master cone is seated and no cone-fit radiograph follows any master cone fit (one after the first fit is enough here; a later refit is judged by cone-fit-retake-needed).',
    source: `${PRACTICE}: radiograph the cone fit before seating.`,
  },
  'cone-fit-retake-needed': {
    title: 'Cone-fit radiograph to retake',
    tolerance: 'coneFitRetakeThresholdMm',
    raisedWhen:
      'Tooth: after the last cone-fit radiograph the cone was refitted at a length differing by at least the threshold from the fit that radiograph showed, or with a cone of another size, and no newer cone-fit radiograph followed.',
    source: `${PRACTICE}: retake the cone-fit radiograph when the cone is changed by 1 mm or more.`,
  },
  'cone-fit-not-approved': {
    title: 'Sealed before the cone fit was approved',
    tolerance: 'requireConeFitApproval',
    raisedWhen:
      "Only while `requireConeFitApproval` is 1: the master cone is seated (the latest seating) and the latest cone-fit decision before it is not an approval. The decisions are the attending's `cone-fit` sign-offs of the canal (approve or return) and the student's live `conefit.approvedAtChair` records; an at-chair record counts unless the latest `cone-fit` sign-off after it is a return (a dispute), even one made after the seating. An approval after the seating does not clear it; seating again after an approval does.",
    source:
      "Coneline (judgement): a school's protocol may have the attending check every cone fit before the canal is sealed; the switch is the school's, off by default.",
  },
  'compaction-before-seat': {
    title: 'Compaction before the master cone was seated',
    raisedWhen: 'A spreader placement or a kept accessory cone is recorded before the master cone is seated.',
    source: `${PRACTICE}: the master cone is seated with sealer before lateral compaction begins.`,
  },
  'spreader-beyond-cwl': {
    title: 'Spreader beyond the CWL',
    raisedWhen: 'A spreader depth is greater than the CWL.',
    source: `${PRACTICE}: the spreader works to the CWL, never past it.`,
  },
  'first-spreader-short': {
    title: 'First spreader placement short',
    tolerance: 'firstSpreaderMarginMm',
    raisedWhen:
      'The first spreader placement after the master cone was seated stopped more than the margin short of the CWL.',
    source: `${PRACTICE}: the first placement reaches within 2 mm of the CWL. Allison, Weber & Walton, J Endod 1979 (seen) support 2 mm only in standardised preparations (1 mm in step-back ones); the default takes 2 mm for every preparation.`,
  },
  'accessory-without-spreader': {
    title: 'Accessory cone without a spreader placement',
    raisedWhen:
      'A kept accessory cone follows no spreader placement since the previous kept cone (a replacement for a withdrawn cone may use the same spreader placement).',
    source: `${PRACTICE}: each accessory cone goes into the space a spreader has just made.`,
  },
  'accessory-length-mismatch': {
    title: 'Accessory cone length differs from the spreader depth',
    tolerance: 'accessoryLengthMarginMm',
    raisedWhen:
      'A kept accessory cone was measured to a length that differs from the depth of the latest spreader placement before it by more than the margin.',
    source: `${PRACTICE}: each cone is measured to the depth the spreader reached.`,
  },
  'accessory-short': {
    title: 'Accessory cone stopped short',
    raisedWhen:
      'An accessory cone was recorded as not reaching its length and has not been withdrawn (a likely void); withdrawing it clears the finding. Its measured length alone never raises this.',
    source: `${PRACTICE}: a cone that stops short of the spreader's depth leaves a void and is replaced.`,
  },
  'accessory-beyond-cwl': {
    title: 'Accessory cone past the CWL',
    raisedWhen:
      'A kept accessory cone was measured to a length greater than the CWL, at the tap; withdrawing it clears the finding.',
    source: `${PRACTICE}: no cone or instrument goes past the CWL, as for the spreader.`,
  },
  'accessory-size-mismatch': {
    title: 'Accessory cone size differs from the spreader',
    raisedWhen: "A kept accessory cone's size differs from the size of the spreader in the latest placement before it.",
    source: `${PRACTICE}: the accessory cone's size matches the spreader's.`,
  },
  'compaction-incomplete': {
    title: 'Compaction incomplete',
    tolerance: 'fallbackStopDepthMm',
    raisedWhen:
      'When compaction is finished (`compaction.finished`) and again at sear-off, the last spreader depth before it still lies beyond the coronal third (or no spreader placement was recorded); the verdict at sear-off replaces the one at the finish. Where no orifice depth was recorded the thirds are estimated from the fallback stop depth.',
    source: `${PRACTICE}: stop when the spreader no longer passes the coronal third, about 10–12 mm from a cusp reference in most teeth.`,
  },
  'few-accessory-cones': {
    title: 'Few accessory cones',
    tolerance: 'minAccessoryCones',
    raisedWhen: 'Tooth: at sear-off fewer kept accessory cones remain than the usual minimum.',
    source: `${PRACTICE}: usually 4–5 accessory cones in an average canal, more in wide ones.`,
  },
  'fill-check-radiograph-missing': {
    title: 'Fill-check radiograph missing',
    raisedWhen: 'Tooth: sear-off is recorded with no fill-check radiograph after the last kept accessory cone.',
    source: `${PRACTICE}: radiograph the fill before cutting it, while the cones can still be pulled out.`,
  },
  'fill-short': {
    title: 'Fill short',
    tolerance: 'fillShortLimitMm',
    raisedWhen:
      "The latest fill assessment says the fill ends more than 2 mm short of the radiographic apex (on a clear training block, of the canal's end, judged by eye).",
    source:
      'European Society of Endodontology quality guidelines, Int Endod J 2006 (seen, secondary); Jurič et al., Int Endod J 2024 (seen).',
  },
  'fill-beyond': {
    title: 'Fill beyond the apex',
    raisedWhen: 'The latest fill assessment says the fill extends beyond the apex.',
    source:
      'European Society of Endodontology quality guidelines, Int Endod J 2006 (seen, secondary); Jurič et al., Int Endod J 2024 (seen).',
  },
  'fill-voids': {
    title: 'Voids in the fill',
    raisedWhen: 'The latest fill assessment shows voids.',
    source: `${PRACTICE}: the fill-check radiograph shows even density with no voids.`,
  },
  'sear-above-cej': {
    title: 'Seared above the CEJ',
    raisedWhen:
      'Tooth: the sear level (the latest sear-off) is above the CEJ; in an anterior tooth (FDI x1–x3) the message warns of crown staining.',
    source: `${PRACTICE}: sear at the orifice, or at or up to 1 mm below the CEJ; in anterior teeth at or below it so sealer cannot stain the crown.`,
  },
  'sear-level-missing': {
    title: 'Sear level not recorded',
    raisedWhen:
      'Tooth, anterior teeth only (FDI x1–x3): the latest sear-off records no level against the CEJ, so a level that could stain the crown cannot be judged.',
    source: `${PRACTICE}: in anterior teeth the gutta-percha is seared at or below the CEJ, so its level is recorded.`,
  },
  'restoration-missing': {
    title: 'Access not restored',
    raisedWhen:
      'The case is submitted with a canal whose access is not restored (a case-level restoration counts for every canal).',
    source: `${PRACTICE}: the access is restored, temporarily or permanently, before the case is closed.`,
  },
  'postop-radiograph-missing': {
    title: 'Post-operative radiograph missing',
    raisedWhen: 'Tooth: the case is submitted without a post-operative radiograph (case-level or on the canal).',
    source: `${PRACTICE}: post-operative radiographs close the procedure.`,
  },
};

/** Every finding code, in the order of docs/rules.md's table. */
export const FINDING_CODES = /* @__PURE__ */ Object.keys(SEVERITY) as FindingCode[];

function withSeverities(catalogue: typeof CATALOGUE): Record<FindingCode, FindingInfo> {
  return Object.fromEntries(
    FINDING_CODES.map((code) => [code, { severity: SEVERITY[code], ...catalogue[code] }]),
  ) as Record<FindingCode, FindingInfo>;
}

/** Every finding with its severity, in the order of docs/rules.md's table. */
// Marked pure so that a bundle that does not read FINDINGS (the chairside island) leaves the
// catalogue out: a call at module level is otherwise kept for its possible side effects.
export const FINDINGS = /* @__PURE__ */ withSeverities(CATALOGUE);
