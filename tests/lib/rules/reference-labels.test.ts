// Each trade value's source and label in the code (referenceValues(), built from the
// constants beside each value) against docs/references.md, table by table.
import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  AVERAGE_LENGTHS,
  averageLengthMm,
  DEFAULT_TOLERANCES,
  FINDINGS,
  referenceValues,
  SOURCE_LABELS,
  TOLERANCE_LABELS,
  TOLERANCE_SOURCES,
  type LabelledValue,
  type Tolerances,
} from '../../../src/lib/rules';

const references = readFileSync(new URL('../../../docs/references.md', import.meta.url), 'utf8');

/** The cells of every Markdown table row in `md`, trimmed, with `\|` kept as a literal bar. */
function tableRows(md: string): string[][] {
  return md
    .split('\n')
    .filter((l) => l.startsWith('|') && !/^\|\s*-+\s*\|/.test(l))
    .map((l) =>
      l
        .slice(1, -1)
        .split(/(?<!\\)\|/)
        .map((c) => c.trim().replace(/\\\|/g, '|')),
    );
}

/** The "Values in the code" rows, by id: { what, value, source, label }. */
function documentedValues(): Map<string, { value: string; source: string; label: string }> {
  const out = new Map<string, { value: string; source: string; label: string }>();
  for (const cells of tableRows(references)) {
    const id = /^`([^`]+)`$/.exec(cells[0] ?? '')?.[1];
    if (id === undefined || cells.length !== 5) continue;
    expect(out.has(id), `${id} is listed twice in docs/references.md`).toBe(false);
    out.set(id, { value: cells[2] ?? '', source: cells[3] ?? '', label: cells[4] ?? '' });
  }
  return out;
}

const values = referenceValues();
const documented = documentedValues();

describe('referenceValues', () => {
  it('lists each value once, with a label of docs/references.md', () => {
    expect(new Set(values.map((v) => v.id)).size).toBe(values.length);
    for (const v of values) expect(SOURCE_LABELS, v.id).toContain(v.label);
  });

  it.each(values.map((v): [string, LabelledValue] => [v.id, v]))(
    '%s has the same value, source and label in docs/references.md',
    (id, v) => {
      expect(documented.get(id), `${id} is missing from docs/references.md, "Values in the code"`).toEqual({
        value: v.value,
        source: v.source,
        label: v.label,
      });
    },
  );

  it('has no row in docs/references.md that the code no longer holds', () => {
    expect([...documented.keys()].filter((id) => !values.some((v) => v.id === id))).toEqual([]);
  });

  it('holds the average lengths the rules compare a CWL with, tooth by tooth', () => {
    const byId = new Map(values.map((v) => [v.id, v]));
    for (const q of [1, 2, 3, 4])
      for (let t = 1; t <= 8; t++) {
        const avg = averageLengthMm(q * 10 + t);
        const arch = q <= 2 ? 'maxillary' : 'mandibular';
        const listed = byId.get(`averageLength.${arch}.${t}`);
        expect(listed?.value, String(q * 10 + t)).toBe(avg === null ? undefined : `${avg} mm`);
      }
  });

  it('holds each tolerance’s default, and the rules reference shows the same source and label', () => {
    for (const key of Object.keys(DEFAULT_TOLERANCES) as (keyof Tolerances)[]) {
      const v = values.find((x) => x.id === `tolerance.${key}`);
      expect(v?.value, key).toBe(`${DEFAULT_TOLERANCES[key]}${key.endsWith('Mm') ? ' mm' : ''}`);
      const { source, label } = TOLERANCE_LABELS[key];
      expect(TOLERANCE_SOURCES[key].toLowerCase(), key).toMatch(
        new RegExp(`^${escape(source.toLowerCase())} \\(${escape(label.replace(' (', ', ').replace(')', ''))}\\): `),
      );
    }
  });
});

describe('the cwl-unusual-for-tooth finding', () => {
  it('names every source of the average lengths with its label', () => {
    const text = FINDINGS['cwl-unusual-for-tooth'].source.toLowerCase();
    for (const { source, label } of Object.values(AVERAGE_LENGTHS)) {
      expect(text, source).toMatch(new RegExp(`${escape(source.toLowerCase())} \\(${label}[:)]`));
    }
  });
});

describe('docs/references.md', () => {
  it('gives every row a label of its own list (seen, partly, memory, practice, computed, judgement)', () => {
    const words = ['seen', 'partly', 'memory', 'practice', 'computed', 'judgement'];
    const labelled = tableRows(references).filter((c) => c.length >= 3 && c.at(-1) !== 'label');
    expect(labelled.length).toBeGreaterThan(40);
    for (const cells of labelled) {
      const label = cells.at(-1) ?? '';
      expect(
        label.split(/\s*\/\s*/).every((part) => words.some((w) => part.startsWith(w))),
        `${cells[0]}: ${label}`,
      ).toBe(true);
    }
  });
});

// Attributions that name no publication (issue 10, item 9): each value names its source, or
// says "trade teaching" (practice), "team's knowledge" (memory) or "Coneline" (judgement).
const UNNAMED = [
  /dental-education/i,
  /\btextbooks\b/i, // "textbookSteps" (a textbook canal) is not an attribution
  /study material/i,
  /dental anatomy texts/i,
  /\bone source\b/i,
  /as summarised/i,
  /\bdental texts\b/i,
];

describe('the sources', () => {
  const rulesDir = new URL('../../../src/lib/rules/', import.meta.url);
  const files: [string, string][] = [
    ...readdirSync(rulesDir)
      .filter((f) => f.endsWith('.ts'))
      .map((f): [string, string] => [`src/lib/rules/${f}`, readFileSync(new URL(f, rulesDir), 'utf8')]),
    // The tests name the sources of the values they use, too (this file holds the patterns).
    ...readdirSync(new URL('./', import.meta.url))
      .filter((f) => f.endsWith('.ts') && f !== 'reference-labels.test.ts')
      .map((f): [string, string] => [`tests/lib/rules/${f}`, readFileSync(new URL(f, import.meta.url), 'utf8')]),
    ['docs/references.md', references],
    ['docs/rules.md', readFileSync(new URL('../../../docs/rules.md', import.meta.url), 'utf8')],
  ];
  it.each(files)('%s names every source it relies on', (_name, text) => {
    for (const pattern of UNNAMED) expect(text).not.toMatch(pattern);
  });
});

function escape(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
}
