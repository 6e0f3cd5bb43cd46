// Coneline records and checks; its messages never advise force. Excess spreader load is the
// classic cause of vertical root fracture (common practice, no source), so no finding tells a
// student to push, force or press harder.
import { readdirSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { evaluateCanal, FINDINGS } from '../../../src/lib/rules';
import { ROOT } from '../../helpers/paths';
import { messyCase, SEED } from './arbitraries';
import { canal, only } from './builder';

const FORCE = /\b(firm\w*|forc\w*|push\w*|harder)\b/i;

describe('finding messages', () => {
  it('advise a finer spreader or more shaping when the first spreader stops short, never force', () => {
    const [f] = only(
      canal({ patch: { sp1: { depthMm: 17.5 }, acc1: { lengthMm: 17.5 } } }).evaluate(),
      'first-spreader-short',
    );
    expect(f?.message).toMatch(/finer spreader/);
    expect(f?.message).toMatch(/shape the canal/);
    expect(f?.message).not.toMatch(FORCE);
  });

  it('hold no force word in any message the rules write (every check file, read as text)', () => {
    const dir = resolve(ROOT, 'src/lib/rules');
    const checks = readdirSync(dir).filter((f) => /^(checks-.*|findings)\.ts$/.test(f));
    expect(checks.length).toBeGreaterThan(2);
    for (const file of checks) {
      // What people read: the code less its comments (which may explain this very rule) and
      // less arrays' .push( calls.
      const code = readFileSync(resolve(dir, file), 'utf8')
        .replace(/\/\*[\s\S]*?\*\//g, '')
        .replace(/\/\/.*$/gm, '')
        .replace(/\.push\(/g, '(');
      expect(code, file).not.toMatch(FORCE);
    }
  });

  it('hold no force word in the catalogue of findings', () => {
    for (const [code, info] of Object.entries(FINDINGS)) expect(JSON.stringify(info), code).not.toMatch(FORCE);
  });

  it('hold no force word in any message raised for generated canals', () => {
    fc.assert(
      fc.property(messyCase(true), (c) => {
        for (const canalId of c.canalIds) {
          for (const f of evaluateCanal(canalId, c.events)?.findings ?? []) expect(f.message).not.toMatch(FORCE);
        }
      }),
      { seed: SEED, numRuns: 200 },
    );
  });
});
