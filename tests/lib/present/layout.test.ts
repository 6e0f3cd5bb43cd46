import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { spreadLabels } from '../../../src/lib/present/layout';

const SEED = 1010;

describe('spreadLabels', () => {
  it('leaves labels that do not crowd each other at their anchors', () => {
    expect(spreadLabels([40, 100, 200], 12, 0, 300)).toEqual([40, 100, 200]);
  });

  it('stacks crowding labels around their anchors, in the anchors’ order', () => {
    expect(spreadLabels([100, 104, 200], 12, 0, 300)).toEqual([96, 108, 200]);
    expect(spreadLabels([104, 100], 12, 0, 300)).toEqual([108, 96]);
  });

  it('slides a stack that would leave the column back inside it', () => {
    expect(spreadLabels([298, 299], 12, 0, 300)).toEqual([282, 294]);
    expect(spreadLabels([-10], 12, 0, 300)).toEqual([6]);
  });

  it('never overlaps labels and keeps them inside the column, whatever the anchors', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: -50, max: 450 }), { maxLength: 25 }), (wanted) => {
        const h = 12;
        const got = spreadLabels(wanted, h, 0, 400);
        const sorted = [...got].sort((a, b) => a - b);
        for (let i = 1; i < sorted.length; i++) expect(sorted[i]! - sorted[i - 1]!).toBeGreaterThanOrEqual(h - 1e-6);
        for (const y of got) {
          expect(y).toBeGreaterThanOrEqual(h / 2 - 1e-6);
          expect(y).toBeLessThanOrEqual(400 - h / 2 + 1e-6);
        }
        // The order of the anchors is kept.
        const byWanted = wanted.map((w, i) => [w, got[i]!] as const).sort((a, b) => a[0] - b[0]);
        for (let i = 1; i < byWanted.length; i++) expect(byWanted[i]![1]).toBeGreaterThanOrEqual(byWanted[i - 1]![1]);
      }),
      { seed: SEED, numRuns: 300 },
    );
  });

  it('spreads evenly when even a tight stack does not fit', () => {
    expect(spreadLabels([10, 10, 10, 10], 12, 0, 40)).toEqual([5, 15, 25, 35]);
  });
});
