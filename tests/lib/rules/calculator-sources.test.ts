import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  CALCULATOR_VALUES,
  calculatorSources,
  LABEL_MEANINGS,
  referenceValues,
  ROUNDING_VALUE,
  type CalculatorId,
} from '../../../src/lib/rules';

const references = readFileSync(new URL('../../../docs/references.md', import.meta.url), 'utf8');

describe('calculatorSources', () => {
  const ids = Object.keys(CALCULATOR_VALUES) as CalculatorId[];

  it('has sources for each calculator of the page', () => {
    expect([...ids].sort()).toEqual(
      ['apex-locator', 'discrepancy', 'iso-sizes', 'proportional', 'step-back', 'thirds', 'tooth-numbers'].sort(),
    );
  });

  it.each(ids)('%s: every value is one of referenceValues(), so docs/references.md lists it', (id) => {
    const known = new Set(referenceValues().map((v) => v.id));
    expect(CALCULATOR_VALUES[id].filter((v) => !known.has(v))).toEqual([]);
    expect(calculatorSources(id).length).toBeGreaterThan(0);
  });

  it('names each method with its source: Grossman for the proportional method, Mullaney and Allison for step-back (seen)', () => {
    expect(calculatorSources('proportional')[0]).toMatchObject({ label: 'seen (secondary)' });
    expect(calculatorSources('proportional')[0]!.source).toContain('Grossman');
    const stepBack = calculatorSources('step-back').map((v) => v.source);
    expect(stepBack.some((s) => s.startsWith('Mullaney'))).toBe(true);
    expect(stepBack.some((s) => s.startsWith('Allison'))).toBe(true);
  });

  it('shows the rounding toward shorter, a judgement, beside every calculator that derives a length', () => {
    for (const id of ['discrepancy', 'apex-locator', 'proportional', 'step-back', 'thirds'] as const) {
      const rounding = calculatorSources(id).find((v) => v.id === ROUNDING_VALUE);
      expect(rounding, id).toMatchObject({ source: 'Coneline', label: 'judgement' });
    }
  });
});

describe('LABEL_MEANINGS', () => {
  it('says what each label means in the words of docs/references.md', () => {
    const listed = Object.fromEntries(
      [...references.matchAll(/^- \*\*([\w ()]+)\*\* — (.+?)[;.]$/gm)].map((m) => [m[1]!, m[2]!]),
    );
    expect(listed).toEqual({ ...LABEL_MEANINGS });
  });
});
