// Where each calculator's values come from, as the calculators page shows them beside each
// calculator. Every entry is a row of docs/references.md, word for word (value, source, label):
// tests/lib/rules/calculator-sources.test.ts holds the two together.

/** How sure we are of a value (docs/references.md, "Labels"). */
export type SourceKind = 'seen' | 'partly' | 'memory' | 'practice' | 'computed' | 'judgement';

/** What each label means, as docs/references.md says it. */
export const SOURCE_KINDS: Readonly<Record<SourceKind, string>> = Object.freeze({
  seen: 'the value was read in a published or secondary source named here',
  partly: 'the source was seen, but the value only in part or second-hand',
  memory: "from the team's knowledge, not yet checked against a source here",
  practice: 'a fact of the trade taught as common practice, with no published source',
  computed: 'arithmetic on a method above (the worked examples the tests hold)',
  judgement: 'our own decision on how to use a value, not a fact about teeth',
});

export interface SourcedValue {
  /** The value as docs/references.md states it. */
  value: string;
  /** Its source, or for a judgement where in the code it is taken. */
  source: string;
  /** The label as written there; its first word is a SourceKind ("partly (15–40 seen)"). */
  label: string;
}

export type CalculatorId =
  'discrepancy' | 'apex-locator' | 'proportional' | 'step-back' | 'thirds' | 'iso-sizes' | 'tooth-numbers';

const DISCREPANCY: SourcedValue = {
  value:
    'radiographic (discrepancy) method: actual length = file length + distance from the file tip to the radiographic apex; working length = actual − 1 mm; subtract 1.5 mm with bone resorption, 2 mm with bone and root resorption',
  source: "Ingle; Weine; Grossman's Endodontic Practice, 13th ed. (secondary pages)",
  label: 'seen',
};

/** Every derived length is floored to the ruler step (floorToHalf). */
export const ROUNDING_SOURCE: SourcedValue = {
  value:
    'a length the calculators derive is taken to 0.01 mm, then rounded down to the 0.5 mm ruler step, never up: a working length is never longer than computed',
  source: '`calculators.ts`, `floorToHalf`',
  label: 'judgement',
};

/** The sources shown beside each calculator, most important first. */
export const CALCULATOR_SOURCES: Readonly<Record<CalculatorId, readonly SourcedValue[]>> = Object.freeze({
  discrepancy: [DISCREPANCY, ROUNDING_SOURCE],
  'apex-locator': [
    {
      value: 'electronic apex locator: working length 0.5–1.0 mm short of the apex reading',
      source: 'Jung et al., J Endod; BioMed Res Int 2020',
      label: 'seen',
    },
    ROUNDING_SOURCE,
  ],
  proportional: [
    {
      value:
        'proportional method: actual length = actual file length × radiographic tooth length ÷ radiographic file length',
      source: 'Grossman / Best (secondary)',
      label: 'seen',
    },
    {
      value:
        "the proportional method's working length takes the radiographic method's allowance (1 mm, 1.5 mm with bone resorption, 2 mm with bone and root resorption) off the actual length",
      source: '`calculators.ts`, `workingLengthByProportion`',
      label: 'judgement',
    },
    DISCREPANCY,
    ROUNDING_SOURCE,
  ],
  'step-back': [
    {
      value:
        "after the MAF, each larger file is shortened: Mullaney's example MAF 25, then 30, 35, 40 at 1, 2, 3 mm short, recapitulating with the MAF",
      source: 'Mullaney, Dent Clin North Am 1979;23(4):575–92',
      label: 'seen',
    },
    {
      value: '0.5 mm per size is also taught (sources differ: 0.5 vs 1.0 mm)',
      source: 'Allison 1979; dental texts',
      label: 'seen',
    },
    ROUNDING_SOURCE,
  ],
  thirds: [
    {
      value:
        'stop when the spreader no longer passes the coronal third (about 10–12 mm from a cusp reference in most teeth)',
      source: 'trade teaching',
      label: 'practice',
    },
    {
      value:
        'with no recorded orifice depth, the orifice is put where the coronal third ends at the fallback stop depth s (12 mm by default): o = (3s − CWL) / 2, kept within 0 and CWL / 2',
      source: '`thirds.ts`, `canalThirds`',
      label: 'judgement',
    },
    ROUNDING_SOURCE,
  ],
  'iso-sizes': [
    {
      value: 'ISO size = tip diameter D0 in hundredths of a mm (size 30 → D0 = 0.30 mm)',
      source: 'ISO 3630-1 as summarised in dental-education pages; ADA Specification No. 28',
      label: 'seen',
    },
    {
      value: 'standard taper 0.02 mm per mm over the 16 mm cutting part, so D16 = D0 + 0.32 mm',
      source: 'ADA Spec. No. 28 as quoted in study material; D16 is arithmetic',
      label: 'partly',
    },
    {
      value: 'colours from 15: white, yellow, red, blue, green, black, repeating for 45–80 and 90–140',
      source: 'ISO 3630-1 as summarised',
      label: 'partly (15–40 seen)',
    },
    { value: '06 pink, 08 grey, 10 purple', source: 'ISO 3630-1', label: 'memory' },
  ],
  'tooth-numbers': [
    {
      value: 'FDI two-digit notation (ISO 3950): quadrants 1–4 permanent, 5–8 primary; teeth 1–8 from the midline',
      source: 'ISO 3950, as documented publicly',
      label: 'seen',
    },
    {
      value:
        'Universal ↔ FDI: quadrant 1 U = 9 − t; quadrant 2 U = 8 + t; quadrant 3 U = 25 − t; quadrant 4 U = 24 + t (e.g. 18↔1, 11↔8, 21↔9, 36↔19, 46↔30)',
      source: 'HL7 FHIR tooth value sets list the pairs; the formula matches them',
      label: 'seen',
    },
    {
      value:
        'Universal letters for primary teeth: A–T from the upper right second molar (55 → A, 65 → J, 75 → K, 85 → T)',
      source: 'dental notation as taught',
      label: 'memory',
    },
  ],
});

/** The SourceKind a label starts with ("partly (15–40 seen)" → "partly"); null when it names none. */
export function sourceKind(label: string): SourceKind | null {
  const first = label.trim().split(/[\s(/]/)[0] ?? '';
  return first in SOURCE_KINDS ? (first as SourceKind) : null;
}
