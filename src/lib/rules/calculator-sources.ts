// The sources the calculators page shows beside each calculator: rows of referenceValues(),
// which are built from the constants beside each value and held to docs/references.md's
// "Values in the code" table by tests/lib/rules/reference-labels.test.ts.
import type { LabelledValue } from './labels';
import { referenceValues } from './reference-values';

export type CalculatorId =
  'discrepancy' | 'apex-locator' | 'proportional' | 'step-back' | 'thirds' | 'iso-sizes' | 'tooth-numbers';

/** The id of the rounding every derived length gets (floorToHalf). */
export const ROUNDING_VALUE = 'calculators.floorToHalf';

/** Each calculator's values, by id of referenceValues(), most important first. */
export const CALCULATOR_VALUES: Readonly<Record<CalculatorId, readonly string[]>> = Object.freeze({
  discrepancy: ['calculators.discrepancy', ROUNDING_VALUE],
  'apex-locator': ['calculators.apexLocator', ROUNDING_VALUE],
  proportional: [
    'calculators.proportional',
    'calculators.proportionalAllowance',
    'calculators.discrepancy',
    ROUNDING_VALUE,
  ],
  'step-back': ['calculators.stepBack.1.0', 'calculators.stepBack.0.5', 'sizes.iso', ROUNDING_VALUE],
  thirds: ['tolerance.fallbackStopDepthMm', 'thirds.orificeEstimate', 'thirds.anteriorReferenceLength', ROUNDING_VALUE],
  'iso-sizes': ['sizes.tipDiameter', 'sizes.standardTaper', 'sizes.colours', 'sizes.iso'],
  'tooth-numbers': ['teeth.fdi', 'teeth.universal', 'teeth.universalPrimary'],
});

/** A calculator's values with their sources and labels; throws for an id referenceValues() lacks. */
export function calculatorSources(id: CalculatorId): LabelledValue[] {
  const all = new Map(referenceValues().map((v) => [v.id, v]));
  return CALCULATOR_VALUES[id].map((valueId) => {
    const v = all.get(valueId);
    if (!v) throw new Error(`no reference value ${valueId}`);
    return v;
  });
}
