import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  DEFAULT_TOLERANCES,
  FINDINGS,
  FINDING_CODES,
  TOLERANCE_RANGES,
  toleranceInRange,
} from '../../../src/lib/rules';
import { renderRulesDoc } from '../../../src/lib/rules/reference-doc';

const docPath = new URL('../../../docs/rules.md', import.meta.url);

describe('renderRulesDoc', () => {
  it('matches docs/rules.md (run `npx tsx scripts/gen-rules-doc.ts` after changing a finding)', () => {
    expect(readFileSync(docPath, 'utf8')).toBe(renderRulesDoc());
  });
  it('lists every code with its severity and, where it has one, its default', () => {
    const doc = renderRulesDoc();
    for (const code of FINDING_CODES) {
      const row = doc.split('\n').find((l) => l.startsWith(`| \`${code}\` |`));
      expect(row, code).toBeDefined();
      expect(row).toContain(`| ${FINDINGS[code].severity} |`);
      const tol = FINDINGS[code].tolerance;
      if (tol !== undefined) expect(row).toContain(`\`${tol}\``);
    }
  });
});

describe('FINDINGS', () => {
  it('holds exactly the codes and severities of docs/rules.md’s table, in its order', () => {
    const table = readFileSync(docPath, 'utf8');
    const rows = [...table.matchAll(/^\| `([a-z-]+)` \| (stop|caution|note) \|/gm)].map((m) => [m[1], m[2]]);
    expect(rows).toHaveLength(34);
    expect(FINDING_CODES.map((c) => [c, FINDINGS[c].severity])).toEqual(rows);
  });
  it('has 34 codes, each with a title, a trigger and a source', () => {
    expect(FINDING_CODES).toHaveLength(34);
    for (const c of FINDING_CODES) {
      expect(FINDINGS[c].title.length, c).toBeGreaterThan(0);
      expect(FINDINGS[c].raisedWhen.length, c).toBeGreaterThan(0);
      expect(FINDINGS[c].source.length, c).toBeGreaterThan(0);
    }
  });
});

describe('DEFAULT_TOLERANCES', () => {
  it('holds docs/rules.md’s defaults: 4, 1.0, 0.5, 1.0, 2.0, 0.5, 3, 12, 2, 0', () => {
    expect(DEFAULT_TOLERANCES).toEqual({
      cwlUnusualMarginMm: 4,
      taperShortMarginMm: 1,
      masterLengthMarginMm: 0.5,
      coneFitRetakeThresholdMm: 1,
      firstSpreaderMarginMm: 2,
      accessoryLengthMarginMm: 0.5,
      minAccessoryCones: 3,
      fallbackStopDepthMm: 12,
      fillShortLimitMm: 2,
      requireConeFitApproval: 0,
    });
  });
});

describe('the rules module', () => {
  const dir = new URL('../../../src/lib/rules/', import.meta.url);
  const files = readdirSync(dir).filter((f) => f.endsWith('.ts'));
  it('imports only its own files and zod', () => {
    for (const f of files) {
      const src = readFileSync(new URL(f, dir), 'utf8');
      for (const m of src.matchAll(/^\s*(?:import|export)\s[^'"]*?from\s+['"]([^'"]+)['"]/gm)) {
        expect(m[1] === 'zod' || m[1]?.startsWith('./'), `${f} imports ${m[1]}`).toBe(true);
      }
    }
  });
  it('uses no Node-only globals, so it runs unchanged in the browser', () => {
    for (const f of files) {
      const src = readFileSync(new URL(f, dir), 'utf8').replace(/\/\/.*$/gm, '');
      expect(src, f).not.toMatch(/\b(process|Buffer|require|__dirname|global)\b|node:/);
    }
  });
  it('bundles for the browser with zod as its only dependency', async () => {
    const { build } = await import('esbuild');
    const out = await build({
      entryPoints: [new URL('index.ts', dir).pathname],
      bundle: true,
      platform: 'browser',
      format: 'esm',
      write: false,
      metafile: true,
      logLevel: 'silent',
    });
    const inputs = Object.keys(out.metafile.inputs);
    expect(inputs.filter((p) => !p.includes('src/lib/rules/') && !p.includes('node_modules/zod/'))).toEqual([]);
  });
  // The chairside island imports core.ts; zod 3 would add about 14 KB gzipped to its budget.
  it('bundles core.ts, the browser’s entry, without zod or anything else outside the module', async () => {
    const { build } = await import('esbuild');
    const out = await build({
      entryPoints: [new URL('core.ts', dir).pathname],
      bundle: true,
      platform: 'browser',
      format: 'esm',
      write: false,
      metafile: true,
      logLevel: 'silent',
    });
    const inputs = Object.keys(out.metafile.inputs);
    expect(inputs.filter((p) => p.includes('zod'))).toEqual([]);
    expect(inputs.filter((p) => !p.includes('src/lib/rules/'))).toEqual([]);
    expect(inputs.some((p) => p.endsWith('src/lib/rules/parse.ts'))).toBe(true);
  });
});

describe('TOLERANCE_RANGES', () => {
  it('gives every tolerance a range that holds its default', () => {
    expect(Object.keys(TOLERANCE_RANGES).sort()).toEqual(Object.keys(DEFAULT_TOLERANCES).sort());
    for (const key of Object.keys(DEFAULT_TOLERANCES) as (keyof typeof DEFAULT_TOLERANCES)[]) {
      expect(TOLERANCE_RANGES[key].min, key).toBeLessThanOrEqual(DEFAULT_TOLERANCES[key]);
      expect(toleranceInRange(key, DEFAULT_TOLERANCES[key]), key).toBe(true);
      expect(toleranceInRange(key, TOLERANCE_RANGES[key].max + 0.5), key).toBe(false);
      expect(toleranceInRange(key, Number.NaN), key).toBe(false);
    }
  });
  it('are listed with their ranges in docs/rules.md', () => {
    const doc = renderRulesDoc();
    for (const key of Object.keys(TOLERANCE_RANGES) as (keyof typeof TOLERANCE_RANGES)[]) {
      const row = doc.split('\n').find((l) => l.startsWith(`| \`${key}\` |`));
      expect(row, key).toContain(`${TOLERANCE_RANGES[key].min}–${TOLERANCE_RANGES[key].max}`);
    }
  });
});
