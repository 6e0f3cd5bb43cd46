import { describe, expect, it } from 'vitest';
import { readCanal, type LogEvent } from '../../../src/lib/rules/core';
import { nextCard as cardFor, rulerValues, type Card, type FlowContext } from '../../../src/lib/client/flow';

type FlowEvent = LogEvent;

const CASE = 'case-1';
const CANAL = 'canal-d';
let clock = Date.parse('2026-03-02T09:00:00Z');
let n = 0;
function ev(type: string, data: object = {}, canalId: string | undefined = CANAL): FlowEvent {
  clock += 1000;
  n += 1;
  const id = `e${String(n).padStart(3, '0')}`;
  const at = new Date(clock).toISOString();
  return { id, caseId: CASE, ...(canalId ? { canalId } : {}), type, at, data } as unknown as FlowEvent;
}
const ctx = (over: Partial<FlowContext> = {}): FlowContext => ({
  findingCodes: [],
  compactionFinished: false,
  ...over,
});
/** The card for the canal as the rules core reads these events (the island's one path). */
function nextCard(events: FlowEvent[], canalId: string, context: FlowContext): Card {
  const reading = readCanal(canalId, events);
  if (!reading) throw new Error('the rules core found no canal');
  return cardFor(reading, context);
}
/** The same events on a training block. */
const onBlock = (events: FlowEvent[]) =>
  events.map((e) => (e.type === 'case.opened' ? ({ ...e, data: { setting: 'block' } } as FlowEvent) : e));

/** The events of an extracted lower first molar's distal canal up to a seated master cone. */
function upToSeated(): FlowEvent[] {
  return [
    ev('case.opened', { setting: 'extracted', tooth: 36 }, undefined),
    ev('canal.added', { name: 'D', referencePoint: 'DB cusp', cwlMm: 20.5, mafSize: '35', preparation: 'step-back' }),
    ev('seat.checked', { fileSize: '35', lengthMm: 20.5, result: 'seated' }),
    ev('taper.checked', { spreader: 'MF', depthMm: 19.5 }),
    ev('radiograph.taken', { purpose: 'maf' }),
    ev('canal.rinsed', { solutions: ['naocl', 'edta'] }),
    ev('canal.dried', { pointSize: 'medium', measuredMm: 20.5 }),
    ev('master.fitted', { size: '35', lengthMm: 20.5, reachedLength: true }),
    ev('radiograph.taken', { purpose: 'cone-fit' }),
    ev('master.seated', { sealer: 'epoxy-resin' }),
  ];
}

describe('nextCard', () => {
  it('walks the set-up steps in order, centring each ruler on the expected length', () => {
    const all = upToSeated();
    const kinds = [];
    for (let i = 2; i <= all.length; i++) kinds.push(nextCard(all.slice(0, i), CANAL, ctx()));
    expect(kinds.map((c) => c.kind)).toEqual([
      'seat',
      'taper',
      'radiograph',
      'rinse',
      'dry',
      'master',
      'radiograph',
      'seal',
      'spreader',
    ]);
    expect(kinds[1]).toEqual({ kind: 'taper', centre: 19.5 });
    expect(kinds[4]).toEqual({ kind: 'dry', centre: 20.5 });
    expect(kinds[8]).toMatchObject({ kind: 'spreader', cycle: 1, centre: 18.5 });
  });

  it('skips radiographs on a training block', () => {
    const all = onBlock(upToSeated().filter((e) => e.type !== 'radiograph.taken'));
    expect(nextCard(all.slice(0, 4), CANAL, ctx()).kind).toBe('rinse');
    expect(nextCard(all.slice(0, 7), CANAL, ctx()).kind).toBe('seal');
  });

  it('asks for the master cone again after a short fit', () => {
    const all = upToSeated().slice(0, 7);
    all.push(ev('master.fitted', { size: '35', lengthMm: 19, reachedLength: false }));
    expect(nextCard(all, CANAL, ctx())).toEqual({ kind: 'master', centre: 20.5, refit: true });
  });

  it('asks for the cone-fit radiograph again when the rules say a retake is needed', () => {
    const all = upToSeated().slice(0, 9);
    expect(nextCard(all, CANAL, ctx()).kind).toBe('seal');
    expect(nextCard(all, CANAL, ctx({ findingCodes: ['cone-fit-retake-needed'] }))).toEqual({
      kind: 'radiograph',
      purpose: 'cone-fit',
    });
  });

  it('leads a short accessory cone straight to removing it and placing another at the same depth', () => {
    const all = upToSeated();
    all.push(ev('spreader.placed', { spreader: 'MF', depthMm: 18.5 }));
    expect(nextCard(all, CANAL, ctx())).toMatchObject({ kind: 'accessory', cycle: 1, depthMm: 18.5, redo: false });
    const short = ev('accessory.placed', { size: 'MF', lengthMm: 18.5, reachedLength: false });
    all.push(short);
    expect(nextCard(all, CANAL, ctx())).toEqual({ kind: 'remove', eventId: short.id, lengthMm: 18.5, depthMm: 18.5 });
    all.push(ev('accessory.removed', { eventId: short.id, reason: 'stopped short' }));
    expect(nextCard(all, CANAL, ctx())).toMatchObject({ kind: 'accessory', cycle: 1, depthMm: 18.5, redo: true });
    expect(nextCard(all, CANAL, ctx({ replaceSpreader: true }))).toMatchObject({
      kind: 'spreader',
      cycle: 1,
      centre: 18.5,
    });
    all.push(ev('accessory.placed', { size: 'MF', lengthMm: 18.5, reachedLength: true }));
    expect(nextCard(all, CANAL, ctx())).toMatchObject({ kind: 'spreader', cycle: 2, centre: 18.5 });
  });

  it('goes back to the card an undone tap answered', () => {
    const all = upToSeated();
    const spread = ev('spreader.placed', { spreader: 'MF', depthMm: 18.5 });
    all.push(spread, ev('event.voided', { eventId: spread.id, reason: 'undo' }));
    expect(nextCard(all, CANAL, ctx()).kind).toBe('spreader');
  });

  it('goes back to a step whose answer was withdrawn from the timeline, then on to where it was', () => {
    const all = upToSeated();
    const taper = all.find((e) => e.type === 'taper.checked')!;
    all.push(ev('event.voided', { eventId: taper.id, reason: 'Withdrawn from the timeline' }));
    expect(nextCard(all, CANAL, ctx())).toEqual({ kind: 'taper', centre: 19.5 });
    all.push(ev('taper.checked', { spreader: 'MF', depthMm: 19 }));
    expect(nextCard(all, CANAL, ctx()).kind).toBe('spreader');
  });

  it('moves to the fill check once compaction is finished, then sear, compaction, cleaning', () => {
    const all = upToSeated();
    all.push(
      ev('spreader.placed', { spreader: 'MF', depthMm: 18.5 }),
      ev('accessory.placed', { size: 'MF', lengthMm: 18.5, reachedLength: true }),
    );
    expect(nextCard(all, CANAL, ctx({ compactionFinished: true }))).toEqual({
      kind: 'fill',
      radiographTaken: false,
      needsRadiograph: true,
    });
    all.push(ev('radiograph.taken', { purpose: 'fill-check' }));
    expect(nextCard(all, CANAL, ctx())).toEqual({ kind: 'fill', radiographTaken: true, needsRadiograph: true });
    all.push(ev('fill.assessed', { length: 'flush', voids: false }));
    expect(nextCard(all, CANAL, ctx()).kind).toBe('sear');
    all.push(ev('gp.seared', { atOrifice: true }));
    expect(nextCard(all, CANAL, ctx()).kind).toBe('compact');
    all.push(ev('gp.compacted', {}));
    expect(nextCard(all, CANAL, ctx()).kind).toBe('clean');
    all.push(ev('chamber.cleaned', { agent: 'alcohol' }));
    expect(nextCard(all, CANAL, ctx()).kind).toBe('done');
  });

  it('tells the spreader card when the rules core finds compaction complete', () => {
    const all = upToSeated();
    all.push(
      ev('spreader.placed', { spreader: 'MF', depthMm: 11 }),
      ev('accessory.placed', { size: 'MF', lengthMm: 11, reachedLength: true }),
    );
    expect(nextCard(all, CANAL, ctx())).toMatchObject({
      kind: 'spreader',
      cycle: 2,
      centre: 11,
      complete: true,
    });
  });
});

describe('rulerValues', () => {
  it('lists half-millimetre steps around the centre within the schema range', () => {
    expect(rulerValues(19.5, 1)).toEqual([18.5, 19, 19.5, 20, 20.5]);
    expect(rulerValues(1, 1)).toEqual([0.5, 1, 1.5, 2]);
  });
});
