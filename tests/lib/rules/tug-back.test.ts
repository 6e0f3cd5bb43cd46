// Tug-back is recorded but never judged: a published study found it made no difference
// (J Oral Sci 2007;49(4):283–6 — seen, docs/references.md).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { renderRulesDoc } from '../../../src/lib/rules/reference-doc';
import { canal } from './builder';

describe('tugBack on master.fitted', () => {
  it('raises no finding whether the cone had tug-back, had none or was not asked', () => {
    const withTugBack = canal().evaluate().findings;
    expect(withTugBack).toEqual([]);
    expect(canal({ patch: { fit: { tugBack: false } } }).evaluate().findings).toEqual(withTugBack);
    expect(canal({ patch: { fit: { tugBack: undefined } } }).evaluate().findings).toEqual(withTugBack);
  });
  it('is shown in the canal state as recorded', () => {
    expect(canal({ patch: { fit: { tugBack: false } } }).evaluate().state.masterCone).toMatchObject({
      tugBack: false,
    });
  });
});

describe('the rules reference', () => {
  it('says tugBack is recorded but never judged, and why, citing the study docs/references.md lists', () => {
    const line = renderRulesDoc()
      .split('\n')
      .find((l) => l.includes('`tugBack`'));
    expect(line).toMatch(/no check judges it/);
    expect(line).toContain('J Oral Sci 2007;49(4):283–6');
    const references = readFileSync(new URL('../../../docs/references.md', import.meta.url), 'utf8');
    expect(references).toMatch(/tug-back made no difference\s*\|\s*J Oral Sci 2007;49\(4\):283–6\s*\|\s*seen/);
  });
});
