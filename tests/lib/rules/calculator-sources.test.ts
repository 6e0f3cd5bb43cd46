import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { CALCULATOR_SOURCES, ROUNDING_SOURCE, SOURCE_KINDS, sourceKind } from '../../../src/lib/rules';

const references = readFileSync(new URL('../../../docs/references.md', import.meta.url), 'utf8');

/** Every table row of docs/references.md as its trimmed cells (header and rule rows included). */
function tableRows(): string[][] {
  return references
    .split('\n')
    .filter((line) => line.startsWith('|'))
    .map((line) =>
      line
        .slice(1, -1)
        .split(/(?<!\\)\|/)
        .map((c) => c.trim()),
    );
}

describe('CALCULATOR_SOURCES', () => {
  const rows = tableRows();
  const entries = Object.entries(CALCULATOR_SOURCES).flatMap(([id, list]) => list.map((v) => ({ id, ...v })));

  it('has at least one source for each calculator', () => {
    expect(Object.keys(CALCULATOR_SOURCES).sort()).toEqual(
      ['apex-locator', 'discrepancy', 'iso-sizes', 'proportional', 'step-back', 'thirds', 'tooth-numbers'].sort(),
    );
    for (const [id, list] of Object.entries(CALCULATOR_SOURCES)) expect(list.length, id).toBeGreaterThan(0);
  });

  it.each(entries)('$id: "$value" is a row of docs/references.md with the same source and label', (e) => {
    const row = rows.find((cells) => cells[0] === e.value);
    expect(row, `no row of docs/references.md states: ${e.value}`).toBeDefined();
    expect(row!.slice(1)).toEqual([e.source, e.label]);
  });

  it('labels every value with one of the kinds docs/references.md defines', () => {
    for (const e of entries) expect(sourceKind(e.label), e.label).not.toBeNull();
  });

  it('shows the rounding toward shorter beside every calculator that derives a length', () => {
    for (const id of ['discrepancy', 'apex-locator', 'proportional', 'step-back', 'thirds'] as const)
      expect(CALCULATOR_SOURCES[id], id).toContain(ROUNDING_SOURCE);
  });
});

describe('SOURCE_KINDS', () => {
  it('says what each label means in the words of docs/references.md', () => {
    const labels = Object.fromEntries(
      [...references.matchAll(/^- \*\*(\w+)\*\* — (.+?);?$/gm)].map((m) => [m[1]!, m[2]!.replace(/[;.]$/, '')]),
    );
    expect(labels).toEqual({ ...SOURCE_KINDS });
  });
});

describe('sourceKind', () => {
  it('reads the kind a label starts with', () => {
    expect(sourceKind('partly (15–40 seen)')).toBe('partly');
    expect(sourceKind('seen / partly')).toBe('seen');
    expect(sourceKind('judgement')).toBe('judgement');
    expect(sourceKind('guess')).toBeNull();
    expect(sourceKind('')).toBeNull();
  });
});
