// The canal diagram's layout, read from its markup: where labels and cones are drawn.
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { CanalDiagram, type DiagramState } from '../../../src/components/shared/CanalDiagram';

// Invented canal: CWL 20.5 mm, orifice 9.0 mm from the reference point.
const base: DiagramState = {
  name: 'D',
  referencePoint: 'mesiobuccal cusp tip',
  cwlMm: 20.5,
  thirds: { orificeMm: 9, coronalEndMm: 12.8, middleEndMm: 16.7, cwlMm: 20.5, estimated: false },
  masterCone: { eventId: 'm', size: '35', lengthMm: 20.5, reachedLength: true, seated: true },
  accessories: [],
  spreaderDepths: [],
};
const cone = (eventId: string, lengthMm: number, extra: object = {}) => ({
  eventId,
  size: 'MF',
  lengthMm,
  reachedLength: true,
  removed: false,
  ...extra,
});

function draw(state: DiagramState, compact = false): string {
  return renderToStaticMarkup(createElement(CanalDiagram, { state, compact }));
}

/** An element's attributes from its markup. */
function attrs(tag: string): Record<string, string> {
  return Object.fromEntries([...tag.matchAll(/([\w-]+)="([^"]*)"/g)].map((m) => [m[1]!, m[2]!]));
}

/** The words, y and size of each <text>, and the y of the CWL line (the thick ink line outside any part). */
function layout(svg: string) {
  const texts = [...svg.matchAll(/<text([^>]*)>([^<]*)<\/text>/g)].map((m) => ({
    words: m[2]!,
    y: Number(attrs(m[1]!).y),
    size: Number(attrs(m[1]!)['font-size']),
  }));
  const cwlLine = [...svg.matchAll(/<line([^>]*)>/g)]
    .map((m) => attrs(m[1]!))
    .find((a) => a['stroke-width'] === '3' && a.stroke === '#17212E' && !a['data-part']);
  return { texts, cwlY: Number(cwlLine?.y1) };
}

describe('CanalDiagram', () => {
  it('keeps cone labels above the CWL line and its label below, even for a cone past the CWL', () => {
    const { texts, cwlY } = layout(
      draw({ ...base, accessories: [cone('a1', 21), cone('a2', 20)], spreaderDepths: [20.5, 20] }),
    );
    const cwlLabel = texts.find((t) => t.words.startsWith('CWL'))!;
    expect(cwlLabel.y).toBeGreaterThan(cwlY);
    for (const t of texts.filter((t) => /^[AS]\d/.test(t.words))) expect(t.y, t.words).toBeLessThan(cwlY - 5);
    // The two cone labels, 0.5 mm apart at their tips, are stacked, not drawn on each other.
    const [a1, a2] = ['A1', 'A2'].map((n) => texts.find((t) => t.words.startsWith(n))!.y);
    expect(Math.abs(a1! - a2!)).toBeGreaterThanOrEqual(13);
  });

  it('draws nothing of the cones above the sear line once seared, and says the level in words below', () => {
    const svg = draw({
      ...base,
      accessories: [cone('a1', 18.5), cone('a2', 16.5, { removed: true })],
      searLevel: { atOrifice: true, relativeToCejMm: 1 },
    });
    const sear = Number(attrs(/<line data-part="sear"[^>]*>/.exec(svg)![0]).y1);
    const cones = [...svg.matchAll(/<g data-part="(?:accessory|removed)"><line([^>]*)>/g)].map((m) => attrs(m[1]!));
    expect(cones).toHaveLength(2);
    for (const a of cones) expect(Math.min(Number(a.y1), Number(a.y2))).toBeGreaterThanOrEqual(sear);
    const master = attrs(/<polygon data-part="master"[^>]*>/.exec(svg)![0]).points!;
    for (const p of master.split(' ')) expect(Number(p.split(',')[1])).toBeGreaterThanOrEqual(sear);
    expect(/<figcaption[^>]*>(.*?)<\/figcaption>/.exec(svg)![1]).toContain(
      'seared at the orifice, 1.0 mm below the CEJ',
    );
    expect(attrs(/<svg[^>]*>/.exec(svg)![0])['aria-label']).toContain('1.0 mm below the CEJ');
    for (const t of layout(svg).texts) expect(t.words).not.toMatch(/CEJ/);
  });

  it('draws a compact diagram with larger words and no label per cone or depth', () => {
    const state = { ...base, accessories: [cone('a1', 18.5)], spreaderDepths: [18.5] };
    const full = layout(draw(state)).texts;
    const small = layout(draw(state, true)).texts;
    expect(full.some((t) => t.words.startsWith('A1'))).toBe(true);
    expect(small.some((t) => /^[AS]\d/.test(t.words))).toBe(false);
    expect(Math.min(...small.map((t) => t.size))).toBeGreaterThan(Math.min(...full.map((t) => t.size)));
  });
});
