// Every trade value the rules core labels, gathered from beside each value into one list in
// the shape of docs/references.md's "Values in the code" table. The list is built from the
// constants the code uses, so a value changed in the code changes here too, and
// tests/lib/rules/reference-labels.test.ts then wants the same value, source and label in docs.
import { AVERAGE_LENGTHS, SECOND_CANAL_PAIR, SECOND_CANAL_SOURCE } from './anatomy';
import {
  APEX_LOCATOR_BACK_OFF_MM,
  APEX_LOCATOR_SOURCE,
  DISCREPANCY_SOURCE,
  FLOOR_TO_HALF_SOURCE,
  PROPORTIONAL_ALLOWANCE_SOURCE,
  PROPORTIONAL_SOURCE,
  RESORPTION_ALLOWANCE_MM,
  STEP_BACK_SOURCES,
} from './calculators';
import type { LabelledValue } from './labels';
import { NON_STANDARD_SIZES, SIZE_SOURCES } from './sizes';
import { TOOTH_NUMBER_SOURCES } from './teeth';
import { ORIFICE_ESTIMATE_SOURCE, STOP_DEPTH_REFERENCE_LENGTH_MM, STOP_DEPTH_SCALING_SOURCE } from './thirds';
import { DEFAULT_TOLERANCES, TOLERANCE_LABELS, type Tolerances } from './tolerances';

const TOOTH_TYPES = ['', 'central incisor', 'lateral incisor', 'canine', 'first premolar', 'second premolar'];
const MOLARS = ['', '', '', '', '', '', 'first molar', 'second molar'];

function averageLengths(): LabelledValue[] {
  return Object.entries(AVERAGE_LENGTHS).map(([key, v]) => {
    const [arch = '', digit = ''] = key.split(':');
    const t = Number(digit);
    return {
      id: `averageLength.${arch}.${digit}`,
      what: `${arch} ${TOOTH_TYPES[t] || MOLARS[t] || ''} (FDI x${digit})`,
      value: `${v.mm} mm`,
      source: v.source,
      label: v.label,
    };
  });
}

function tolerances(): LabelledValue[] {
  return (Object.keys(DEFAULT_TOLERANCES) as (keyof Tolerances)[]).map((key) => ({
    id: `tolerance.${key}`,
    what: `default of \`${key}\``,
    value: `${DEFAULT_TOLERANCES[key]}${key.endsWith('Mm') ? ' mm' : ''}`,
    ...TOLERANCE_LABELS[key],
  }));
}

/** Every labelled trade value of the rules core, in the order of docs/references.md's table. */
export function referenceValues(): LabelledValue[] {
  return [
    ...averageLengths(),
    ...tolerances(),
    {
      id: 'thirds.anteriorReferenceLength',
      what: 'tooth length the fallback stop depth is scaled from on anterior teeth (s × A / 21)',
      value: `${STOP_DEPTH_REFERENCE_LENGTH_MM} mm`,
      ...STOP_DEPTH_SCALING_SOURCE,
    },
    {
      id: 'canals.secondCanal',
      what: 'second canal offered for FDI 31, 32, 41, 42, 34, 44, 15, 25',
      value: SECOND_CANAL_PAIR.join(', '),
      ...SECOND_CANAL_SOURCE,
    },
    { id: 'sizes.iso', what: 'ISO sizes', value: '06, 08, 10, 15–60 by 5, 70–140 by 10', ...SIZE_SOURCES.isoSizes },
    { id: 'sizes.tipDiameter', what: 'tip diameter D0', value: 'size ÷ 100 mm', ...SIZE_SOURCES.tipDiameter },
    { id: 'sizes.standardTaper', what: 'standard taper', value: '0.02 mm/mm', ...SIZE_SOURCES.standardTaper },
    {
      id: 'sizes.colours',
      what: 'ISO colour code',
      value: '06 pink, 08 grey, 10 purple; from 15 white, yellow, red, blue, green, black, repeating',
      ...SIZE_SOURCES.colours,
    },
    {
      id: 'sizes.nonStandard',
      what: 'accessory cone and spreader designations',
      value: NON_STANDARD_SIZES.join(', '),
      ...SIZE_SOURCES.nonStandard,
    },
    {
      id: 'calculators.proportional',
      what: 'proportional working length',
      value: 'actual file length × radiographic tooth length ÷ radiographic file length',
      ...PROPORTIONAL_SOURCE,
    },
    { id: 'calculators.stepBack.1.0', what: 'step-back step per size', value: '1 mm', ...STEP_BACK_SOURCES['1.0'] },
    { id: 'calculators.stepBack.0.5', what: 'step-back step per size', value: '0.5 mm', ...STEP_BACK_SOURCES['0.5'] },
    ...calculatorValues(),
  ];
}

const mm = (v: number) => `${v} mm`;

/** The values the calculators page uses beyond those above. */
function calculatorValues(): LabelledValue[] {
  const a = RESORPTION_ALLOWANCE_MM;
  const allowances = `${mm(a.none)}; ${mm(a.bone)} with bone resorption, ${mm(a['bone-and-root'])} with bone and root resorption`;
  return [
    {
      id: 'calculators.discrepancy',
      what: 'radiographic (discrepancy) working length',
      value: `file length + file tip to radiographic apex, less ${allowances}`,
      ...DISCREPANCY_SOURCE,
    },
    {
      id: 'calculators.apexLocator',
      what: 'working length from an apex locator',
      value: `the reading less ${APEX_LOCATOR_BACK_OFF_MM.min.toFixed(1)}–${APEX_LOCATOR_BACK_OFF_MM.max.toFixed(1)} mm`,
      ...APEX_LOCATOR_SOURCE,
    },
    {
      id: 'calculators.proportionalAllowance',
      what: "proportional method's working length",
      value: `the actual length less the radiographic method's allowance: ${allowances}`,
      ...PROPORTIONAL_ALLOWANCE_SOURCE,
    },
    {
      id: 'calculators.floorToHalf',
      what: 'every length the calculators derive',
      value: 'taken to 0.01 mm, then rounded down to the 0.5 mm ruler step, never up',
      ...FLOOR_TO_HALF_SOURCE,
    },
    {
      id: 'thirds.orificeEstimate',
      what: 'orifice depth o when none was recorded, from the fallback stop depth s',
      value: 'o = (3s − CWL) / 2, kept within 0 and CWL / 2',
      ...ORIFICE_ESTIMATE_SOURCE,
    },
    {
      id: 'teeth.fdi',
      what: 'FDI two-digit tooth numbers',
      value: 'quadrants 1–4 permanent, 5–8 primary; teeth 1–8 from the midline',
      ...TOOTH_NUMBER_SOURCES.fdi,
    },
    {
      id: 'teeth.universal',
      what: 'Universal number of a permanent FDI tooth t in quadrant q',
      value: 'q1: 9 − t; q2: 8 + t; q3: 25 − t; q4: 24 + t (18 → 1, 11 → 8, 21 → 9, 36 → 19, 46 → 30)',
      ...TOOTH_NUMBER_SOURCES.universal,
    },
    {
      id: 'teeth.universalPrimary',
      what: 'Universal letters for primary teeth',
      value: 'A–T from the upper right second molar (55 → A, 65 → J, 75 → K, 85 → T)',
      ...TOOTH_NUMBER_SOURCES.universalPrimary,
    },
  ];
}
