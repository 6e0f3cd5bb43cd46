// Renders docs/rules.md from the catalogue, so the reference page cannot drift from the code.
// scripts/gen-rules-doc.ts writes it; a test regenerates it and compares.
import { FINDINGS, FINDING_CODES, SAFETY_LINE } from './findings';
import { averageLengthMm } from './anatomy';
import { fallbackStopDepthFor, STOP_DEPTH_REFERENCE_LENGTH_MM } from './thirds';
import { DEFAULT_TOLERANCES, TOLERANCE_RANGES, TOLERANCE_SOURCES, type Tolerances } from './tolerances';

/** How this module reads the places where the checks' wording leaves room; each is also commented in the code. */
export const READINGS: readonly string[] = [
  'Where a set-up event (`case.opened`, `canal.added`) is recorded twice and neither is voided, the latest counts; the case is the one the earliest `canal.added` of the canal names.',
  'A void counts only for an event of its own scope (the same canal, or both case-level); `event.voided` may therefore be case-level. A void that is itself the target of any void voids nothing (one level, so the order voids are read never matters).',
  'When the master cone is seated more than once, the latest seating is the one judged by the seat, taper, rinse and radiograph checks and by `first-spreader-short`; `compaction-before-seat` looks before the first seating.',
  'Before any seating, the latest seat and taper checks are judged at once (`seat-not-confirmed`, `seat-file-not-maf`, `taper-short`, `taper-beyond-cwl`), so the tablet can answer at the tap; a later passing check clears them. A taper check deeper than the CWL is a caution (`taper-beyond-cwl`), not `spreader-beyond-cwl`: the taper check is not a spreader placement, but a spreader that passes the CWL there suggests the apical stop may be lost.',
  '`taper-not-checked` counts only a taper check recorded before the seating (the latest one before seating is the one that counts); `maf-radiograph-missing` counts an MAF radiograph recorded anywhere.',
  '`master-size-mismatch`, `master-length-mismatch` and `master-beyond-cwl` judge the latest fit: a refit replaces the cone. A fit past the CWL by any amount is `master-beyond-cwl`; the margin applies only to a fit short of the CWL. `cone-fit-retake-needed` compares the latest refit after the last cone-fit radiograph with the fit that radiograph showed (another size, or a length at least the threshold away); a cone-fit radiograph counts only once it follows a fit.',
  'Withdrawn accessory cones are not judged by any per-cone check (they are no longer in the canal). The cycle of the first cone opens at the latest seating before it, so a spreader placed before seating does not count for it.',
  "`compaction-incomplete` is judged at the latest `compaction.finished` and again at the latest sear-off, whose verdict replaces the finish's; it is raised also when no spreader placement was recorded at all. Voiding `compaction.finished` withdraws the judgement made at it. On a training block with no recorded orifice depth the orifice is its top (0), not an estimate.",
  '`accessory-beyond-cwl` judges kept cones only, like `accessory-short`: withdrawing the cone clears it.',
  '`cwl-corrected-without-reason` judges the correction in use (the latest); a later correction with a reason clears it. The tablet asks for a reason; older tablets and other clients may still send an empty one, which the contract accepts.',
  '`sear-level-missing` applies to anterior teeth (FDI x1–x3) on extracted teeth and patients; a level of 0 (at the CEJ) is a level.',
  '`master.fitted` records `tugBack` when the student answers it, but no check judges it: tug-back made no difference to the seal in a published comparison (J Oral Sci 2007;49(4):283–6, see references.md), so it is shown, not graded.',
  '`few-accessory-cones` counts the kept cones placed before the latest sear-off; `fill-check-radiograph-missing` wants a fill-check radiograph after the last kept cone (any, when there is none).',
  'The fill categories are fixed by the contract at 2 mm: `fill-short` is raised for "short-over-2" while `fillShortLimitMm` is 2 or less, and not when a director raises the limit (the category cannot show the fill passed a larger limit).',
  '`sear-above-cej` is raised for any level above the CEJ, at the orifice or not; `restoration-missing` applies to training blocks too (its check is not marked "tooth").',
  'Sizes: a number is read as the ISO size it names (35 → "35", 6 → "06"); a string must be written as the contract writes it ("06", not "6"; designations in capitals). All size fields accept designations, as the input errors allow, though a file (`mafSize`, `fileSize`) is in practice an ISO size.',
  "Free text is trimmed; `name`, `referencePoint`, `text` and `agent` must not be empty; `reason` must be present but may be empty. `chartRef` (≤ 64) and `agent` (≤ 60) are not among the contract's free-text fields and take our own limits. A tooth on a training block is allowed and ignored by the rules.",
  'Status is the furthest step any event reaches: set-up (canal.added) → verified (seat or taper check, rinse, drying, working-length or MAF radiograph) → cone fitted (master cone fit or cone-fit radiograph) → compacting (seating, spreader, accessory cone, compaction finished) → filled (fill assessment or fill-check radiograph) → seared (sear-off, vertical compaction, chamber cleaned) → restored → submitted. A case-level restoration restores only the canals already seared when it was recorded.',
  "`cone-fit-not-approved` is the one check that reads a fact beside the events: the canal's `cone-fit` sign-offs, which the server passes in (`evaluateCanal`'s `review`; the projection reads them from the sign-offs table, and judges the canal again when one is added). Sign-offs carry the server's time and events the tablet's; the rules compare them as instants, and set a cone-fit record against the sign-offs by when the server received it (`review.received`, as the review queue does), else by its own `at`. A `conefit.requested` decides nothing; a voided `conefit.approvedAtChair` does not count. Turning `requireConeFitApproval` on judges every unlocked canal again, so canals already sealed without an approval get the stop: a school turns it on before a term starts. The tablet judges with the default tolerances, so this stop reaches it with the server's verdict; its sealing card says beforehand that an approval is missing.",
  'A live canal with no `master.seated` is unfilled (`unfilled` in its state), whatever its status: the tablet asks for confirmation before submitting a case with an unfilled canal or an open stop, and the pages show the canal as unfilled.',
];

/** How the thirds are drawn (thirds.ts); tests/lib/rules/thirds.test.ts holds the worked example. */
const THIRDS: readonly string[] = [
  "The canal runs from its orifice, at depth `o` from the reference point, to the CWL; a training block's top is its orifice (`o` = 0). With `L = CWL − o` the coronal third is `[o, o + L/3]`, the middle third `[o + L/3, o + 2L/3]` and the apical third `[o + 2L/3, CWL]`.",
  '',
  'Lateral compaction is complete once the latest spreader depth is at most `o + L/3`: the spreader no longer passes the coronal third.',
  '',
  "Where a tooth's orifice depth was not recorded, `o` is estimated so that the coronal third ends at the fallback stop depth `s` (`fallbackStopDepthMm`, trade teaching of about 10–12 mm from a cusp tip): `o = (3s − CWL) / 2`, kept within `[0, CWL / 2]`. For a CWL of 21 mm and `s` = 12 mm the orifice is put at 7.5 mm. Such thirds are marked as estimated, and `compaction-incomplete` says so.",
  '',
  `On a permanent anterior tooth (FDI x1–x3) \`s\` is scaled by the tooth type's average length \`A\` (the table \`averageLengthMm\` reads, references.md): \`s_tooth = s × A / ${STOP_DEPTH_REFERENCE_LENGTH_MM}\`, and \`o = (3 s_tooth − CWL) / 2\` as above. This scaling is our judgement, not a published value: a long canine's coronal third ends deeper than a short incisor's, and ${STOP_DEPTH_REFERENCE_LENGTH_MM} mm is the length the rule of thumb is taken to be made for — the middle of the 20–22.5 mm most tooth types in the table fall within, and the molars' average, so a molar's estimate is unchanged. With \`s\` = 12 mm a maxillary canine (A = ${averageLengthMm(13)} mm) gets ${fmt2(fallbackStopDepthFor(13, 12))} mm and a mandibular central incisor (A = ${averageLengthMm(31)} mm) ${fmt2(fallbackStopDepthFor(31, 12))} mm. Premolars, molars, primary teeth and training blocks keep \`s\`.`,
];

function fmt2(v: number): string {
  return (Math.round(v * 100) / 100).toFixed(2);
}

/** What the rules derive for one canal (state.ts); the server adds the review states. */
const DERIVED_STATE: readonly string[] = [
  "From a canal's live events the rules derive: its status (set-up, verified, cone-fitted, compacting, filled, seared, restored, submitted; the review states approved and returned come from the sign-off records, and the server puts them in place of the status), the current CWL, the accessory cones kept and those withdrawn, the spreader depths in order, the thirds and whether they are estimated, whether compaction is complete, the radiographs by purpose, the time from the first to the last event, and the open findings.",
];

const cell = (s: string) => s.replace(/\|/g, '\\|').replace(/\n/g, ' ');

function formatDefault(key: keyof Tolerances): string {
  const v = DEFAULT_TOLERANCES[key];
  return key.endsWith('Mm') ? `${v.toFixed(1)} mm` : String(v);
}

function formatRange(key: keyof Tolerances): string {
  const r = TOLERANCE_RANGES[key];
  return `${r.min}–${r.max}${key.endsWith('Mm') ? ' mm' : ''}`;
}

/** The reference page as Markdown. */
export function renderRulesDoc(): string {
  const lines = [
    '# Coneline — rules reference',
    '',
    '<!-- Generated from src/lib/rules by `npx tsx scripts/gen-rules-doc.ts`; do not edit by hand. tests/lib/rules/reference-doc.test.ts fails when this file and the code disagree. -->',
    '',
    `> ${SAFETY_LINE}`,
    '',
    'Severity: **stop** must be put right before the canal can be signed off; **caution** the attending must see; **note** is information. "Tooth:" marks checks that do not apply to a training block. Source labels (seen, partly, memory, practice, judgement) are those of [references.md](references.md); "trade teaching" means common practice with no published source, "team\'s knowledge" a value from memory, "Coneline" our own judgement.',
    '',
    '## Findings',
    '',
    '| code | severity | raised when | default | source |',
    '| --- | --- | --- | --- | --- |',
    ...FINDING_CODES.map((code) => {
      const f = FINDINGS[code];
      const def = f.tolerance === undefined ? '—' : `${formatDefault(f.tolerance)} (\`${f.tolerance}\`)`;
      return `| \`${code}\` | ${f.severity} | ${cell(f.raisedWhen)} | ${def} | ${cell(f.source)} |`;
    }),
    '',
    '## Tolerances',
    '',
    'A course director may change these within the range shown (inclusive); the server refuses a change outside it, and a stored value outside it (or not a number) is logged and replaced by its default. The ranges are our judgement: wide enough for every value the sources disagree on, narrow enough that a slip of the keyboard cannot switch a check off.',
    '',
    '| setting | default | range | source |',
    '| --- | --- | --- | --- |',
    ...(Object.keys(DEFAULT_TOLERANCES) as (keyof Tolerances)[]).map(
      (k) => `| \`${k}\` | ${formatDefault(k)} | ${formatRange(k)} | ${cell(TOLERANCE_SOURCES[k])} |`,
    ),
    '',
    '## Canal thirds and when compaction is complete',
    '',
    ...THIRDS,
    '',
    '## Derived canal state',
    '',
    ...DERIVED_STATE,
    '',
    '## How the checks are read where their wording leaves room',
    '',
    ...READINGS.map((r) => `- ${r}`),
    '',
  ];
  return lines.join('\n');
}
