// fast-check generators: textbook canals and messy cases made only of valid events.
import fc from 'fast-check';
import {
  canalThirds,
  EVENT_TYPES,
  ISO_SIZES,
  isValidFdi,
  NON_STANDARD_SIZES,
  type EventType,
  type LogEvent,
  toothGroup,
} from '../../../src/lib/rules';
import { uuidFor } from './builder';

/**
 * Builds an event without validating it: generation stays fast, and a separate property
 * checks that every generated event passes parseEvent unchanged.
 */
function asEvent(raw: Record<string, unknown>): LogEvent {
  const data = Object.fromEntries(
    Object.entries(raw.data as Record<string, unknown>).filter(([, v]) => v !== undefined),
  );
  const e = Object.fromEntries(Object.entries({ ...raw, data }).filter(([, v]) => v !== undefined));
  return e as unknown as LogEvent;
}

export const SEED = 20261202;
const BASE_MS = Date.parse('2026-12-02T08:00:00.000Z');
const TEETH = Array.from({ length: 89 }, (_, i) => i).filter(isValidFdi);

const half = (min: number, max: number) => fc.integer({ min: min * 2, max: max * 2 }).map((h) => h / 2);
const anySize = fc.constantFrom(...ISO_SIZES, ...NON_STANDARD_SIZES);

interface Draft {
  type: EventType;
  data: Record<string, unknown>;
  caseLevel?: boolean;
}

/** Turns drafts into parsed events with fresh ids and strictly increasing times. */
function materialise(drafts: Draft[], gapsS: number[], caseId: string, canalId: string, idBase: number): LogEvent[] {
  let ms = BASE_MS;
  return drafts.map((d, i) => {
    ms += (gapsS[i % gapsS.length] ?? 1) * 1000;
    return asEvent({
      id: uuidFor(idBase + i),
      caseId,
      canalId: d.caseLevel === true ? undefined : canalId,
      type: d.type,
      at: new Date(ms).toISOString(),
      data: d.data,
    });
  });
}

export interface TextbookCase {
  canalId: string;
  events: LogEvent[];
}

/**
 * A textbook canal: valid lengths, every step in order, every cone reaching its length,
 * compaction until the spreader no longer passes the coronal third, with at least 3 cones;
 * sometimes a cone that stops short is withdrawn and replaced.
 */
export const textbookCanal: fc.Arbitrary<TextbookCase> = fc
  .record({
    setting: fc.constantFrom('block', 'extracted', 'patient'),
    tooth: fc.constantFrom(...TEETH),
    cwl: half(14, 30),
    orificeShare: fc.option(fc.integer({ min: 0, max: 50 }), { nil: undefined }),
    maf: fc.constantFrom(...ISO_SIZES.slice(4, 13)),
    spreader: fc.constantFrom('FF', 'MF', 'F', '20', '25'),
    taperShort: half(0, 1),
    dryShort: half(0, 2),
    // A master cone is never past the CWL (master-beyond-cwl), at most one ruler step short.
    fitOff: half(-0.5, 0),
    firstShort: half(0, 2),
    steps: fc.array(fc.integer({ min: 1, max: 8 }), { minLength: 60, maxLength: 60 }),
    coneOff: fc.array(half(-0.5, 0.5), { minLength: 60, maxLength: 60 }),
    redoAt: fc.option(fc.nat(10), { nil: undefined }),
    finishRecorded: fc.boolean(),
    fill: fc.constantFrom('flush', 'short-0-2'),
    cej: fc.option(half(0, 3), { nil: undefined }),
    gaps: fc.array(fc.integer({ min: 1, max: 300 }), { minLength: 1, maxLength: 10 }),
    n: fc.integer({ min: 1, max: 1_000_000 }),
  })
  .map((g) => {
    const isTooth = g.setting !== 'block';
    const orifice =
      g.orificeShare === undefined ? (isTooth ? undefined : 0) : Math.floor((g.cwl * g.orificeShare) / 100) / 1;
    const orificeMm = orifice === undefined ? undefined : Math.floor(orifice * 2) / 2;
    const thirds = canalThirds(g.cwl, orificeMm, undefined, isTooth ? g.tooth : undefined);
    const drafts: Draft[] = [
      {
        type: 'case.opened',
        data: {
          setting: g.setting,
          tooth: isTooth ? g.tooth : undefined,
          chartRef: g.setting === 'patient' ? 'DEMO-42' : undefined,
        },
        caseLevel: true,
      },
      {
        type: 'canal.added',
        data: {
          name: 'C1',
          referencePoint: 'reference',
          cwlMm: g.cwl,
          mafSize: g.maf,
          preparation: 'step-back',
          orificeDepthMm: orificeMm,
        },
      },
      { type: 'seat.checked', data: { fileSize: g.maf, lengthMm: g.cwl, result: 'seated' } },
      { type: 'taper.checked', data: { spreader: g.spreader, depthMm: g.cwl - g.taperShort } },
    ];
    const rad = (purpose: string, caseLevel = false) => {
      if (isTooth) drafts.push({ type: 'radiograph.taken', data: { purpose }, caseLevel });
    };
    rad('maf');
    drafts.push(
      { type: 'canal.rinsed', data: { solutions: ['naocl', 'edta'] } },
      { type: 'canal.dried', data: { pointSize: 'medium', measuredMm: g.cwl - g.dryShort } },
      { type: 'master.fitted', data: { size: g.maf, lengthMm: Math.min(40, g.cwl + g.fitOff), reachedLength: true } },
    );
    rad('cone-fit');
    drafts.push({ type: 'master.seated', data: { sealer: 'zoe' } });
    let depth = g.cwl - g.firstShort;
    let cones = 0;
    for (let k = 0; k < 60 && (cones < 3 || depth > thirds.coronalEndMm + 1e-9); k++) {
      if (k > 0) depth = Math.max(0.5, depth - (g.steps[k] ?? 1) / 2);
      drafts.push({ type: 'spreader.placed', data: { spreader: g.spreader, depthMm: depth } });
      // Measured to the spreader's depth within one ruler step, never past the CWL.
      const length = Math.min(g.cwl, Math.max(0.5, depth + (g.coneOff[k] ?? 0)));
      if (g.redoAt === k) {
        drafts.push({ type: 'accessory.placed', data: { size: g.spreader, lengthMm: length, reachedLength: false } });
        drafts.push({ type: 'accessory.removed', data: { eventId: '<previous>', reason: 'stopped short' } });
      }
      drafts.push({ type: 'accessory.placed', data: { size: g.spreader, lengthMm: length, reachedLength: true } });
      cones += 1;
    }
    if (g.finishRecorded) drafts.push({ type: 'compaction.finished', data: {} });
    rad('fill-check');
    drafts.push(
      { type: 'fill.assessed', data: { length: g.fill, voids: false } },
      // An anterior tooth's sear level is always recorded (sear-level-missing).
      {
        type: 'gp.seared',
        data: {
          atOrifice: true,
          relativeToCejMm: !isTooth ? undefined : toothGroup(g.tooth).anterior ? (g.cej ?? 0) : g.cej,
        },
      },
      { type: 'gp.compacted', data: {} },
      { type: 'chamber.cleaned', data: { agent: 'alcohol' } },
      { type: 'access.restored', data: { kind: 'temporary' }, caseLevel: true },
    );
    rad('post-op', true);
    drafts.push({ type: 'case.submitted', data: {}, caseLevel: true });
    const idBase = g.n * 1000;
    // A withdrawal names the cone placed just before it.
    drafts.forEach((d, i) => {
      if (d.data.eventId === '<previous>') d.data.eventId = uuidFor(idBase + i - 1);
    });
    const canalId = uuidFor(idBase + 999);
    return { canalId, events: materialise(drafts, g.gaps, uuidFor(idBase + 998), canalId, idBase) };
  });

/** Valid data for any event type; ids named in data are drawn from `ids`. */
function dataFor(type: EventType, ids: string[]): fc.Arbitrary<Record<string, unknown>> {
  const len = half(0.5, 40);
  const someId = ids.length > 0 ? fc.constantFrom(...ids) : fc.constant(uuidFor(1));
  switch (type) {
    case 'case.opened':
      return fc.record({ setting: fc.constantFrom('block', 'extracted'), tooth: fc.constantFrom(...TEETH) });
    case 'canal.added':
      return fc.record({
        name: fc.constantFrom('MB', 'D'),
        referencePoint: fc.constant('cusp'),
        cwlMm: len,
        mafSize: anySize,
        preparation: fc.constantFrom('step-back', '0.04'),
        orificeDepthMm: fc.option(half(0, 20), { nil: undefined }),
      });
    case 'canal.cwlCorrected':
      return fc.record({ cwlMm: len, reason: fc.constant('check') });
    case 'seat.checked':
      return fc.record({ fileSize: anySize, lengthMm: len, result: fc.constantFrom('seated', 'advances', 'short') });
    case 'taper.checked':
    case 'spreader.placed':
      return fc.record({ spreader: anySize, depthMm: len });
    case 'radiograph.taken':
      return fc.record({ purpose: fc.constantFrom('working-length', 'maf', 'cone-fit', 'fill-check', 'post-op') });
    case 'canal.rinsed':
      return fc.record({ solutions: fc.subarray(['naocl', 'edta', 'saline', 'chlorhexidine'], { minLength: 1 }) });
    case 'canal.dried':
      return fc.record({ pointSize: fc.constantFrom('fine', 'medium'), measuredMm: len });
    case 'master.fitted':
      return fc.record({ size: anySize, lengthMm: len, reachedLength: fc.boolean() });
    case 'master.seated':
      return fc.record({ sealer: fc.constantFrom('zoe', 'other') });
    case 'accessory.placed':
      return fc.record({ size: anySize, lengthMm: len, reachedLength: fc.boolean() });
    case 'accessory.removed':
    case 'event.voided':
      return fc.record({ eventId: someId, reason: fc.constant('') });
    case 'fill.assessed':
      return fc.record({
        length: fc.constantFrom('flush', 'short-0-2', 'short-over-2', 'beyond'),
        voids: fc.boolean(),
      });
    case 'gp.seared':
      return fc.record({ atOrifice: fc.boolean(), relativeToCejMm: fc.option(half(-5, 5), { nil: undefined }) });
    case 'chamber.cleaned':
      return fc.constant({ agent: 'alcohol' });
    case 'access.restored':
      return fc.record({ kind: fc.constantFrom('temporary', 'permanent') });
    case 'note.added':
      return fc.constant({ text: 'note' });
    case 'case.discarded':
      return fc.constant({ reason: 'opened by mistake' });
    case 'conefit.approvedAtChair':
      return fc.constantFrom({ attendingId: '4' }, { attendingId: '17' });
    default:
      return fc.constant({});
  }
}

export interface MessyCase {
  canalIds: string[];
  events: LogEvent[];
}

/**
 * A case of two canals with any valid events in any number and order: voids of voids,
 * removals of anything, repeated set-ups. With `ties`, many events share one instant.
 */
export function messyCase(ties: boolean): fc.Arbitrary<MessyCase> {
  return fc.integer({ min: 1, max: 1_000_000 }).chain((n) => {
    const caseId = uuidFor(n * 1000 + 998);
    const canalIds = [uuidFor(n * 1000 + 997), uuidFor(n * 1000 + 996)];
    const ids = Array.from({ length: 40 }, (_, i) => uuidFor(n * 1000 + i));
    // Voids and removals name any step but never the set-up (ids 0–2), so both canals always exist.
    const targets = ids.slice(3);
    const one = (i: number) =>
      fc
        .record({
          type: fc.constantFrom(...EVENT_TYPES.filter((t) => t !== 'case.opened' && t !== 'canal.added')),
          canal: fc.constantFrom(...canalIds),
          minute: ties ? fc.integer({ min: 0, max: 5 }) : fc.constant(i),
        })
        .chain((h) => dataFor(h.type, targets).map((data) => ({ ...h, data, id: ids[i] as string })));
    const steps = fc.tuple(...Array.from({ length: 30 }, (_, i) => one(i + 3)));
    return fc
      .tuple(steps, dataFor('case.opened', ids), dataFor('canal.added', ids), dataFor('canal.added', ids))
      .map(([steps, openData, addedA, addedB]) => {
        const at = (m: number) => new Date(BASE_MS + m * 60_000).toISOString();
        const events: LogEvent[] = [
          asEvent({ id: ids[0], caseId, type: 'case.opened', at: at(0), data: openData }),
          asEvent({ id: ids[1], caseId, canalId: canalIds[0], type: 'canal.added', at: at(0), data: addedA }),
          asEvent({ id: ids[2], caseId, canalId: canalIds[1], type: 'canal.added', at: at(1), data: addedB }),
        ];
        for (const s of steps) {
          const caseLevel =
            s.type === 'case.submitted' ||
            s.type === 'case.discarded' ||
            (s.type === 'access.restored' && s.minute % 2 === 0) ||
            (s.type === 'radiograph.taken' && s.data.purpose === 'post-op');
          events.push(
            asEvent({
              id: s.id,
              caseId,
              canalId: caseLevel ? undefined : s.canal,
              type: s.type,
              at: at(s.minute + 2),
              data: s.data,
            }),
          );
        }
        return { canalIds, events };
      });
  });
}
