import type { CanalReading, LogEvent } from '../rules/core';

/**
 * Which card the stepper shows next for a canal (docs/architecture.md, "The tablet").
 * Pure: it reads what the rules core derived for the canal — the events that count and its
 * CanalState — and never recounts or judges a value itself. Steps are found by what has
 * been recorded, not by position, so a canal restored from the server or recorded out of
 * order still lands on the right card.
 */
export type Card =
  | { kind: 'seat' }
  | { kind: 'taper'; centre: number }
  | { kind: 'radiograph'; purpose: 'maf' | 'cone-fit' }
  | { kind: 'rinse' }
  | { kind: 'dry'; centre: number }
  | { kind: 'master'; centre: number; refit: boolean }
  | { kind: 'seal' }
  | { kind: 'spreader'; cycle: number; centre: number; complete: boolean }
  | { kind: 'accessory'; cycle: number; depthMm: number; redo: boolean }
  | { kind: 'remove'; eventId: string; lengthMm: number; depthMm: number }
  | { kind: 'fill'; radiographTaken: boolean; needsRadiograph: boolean }
  | { kind: 'sear' }
  | { kind: 'compact' }
  | { kind: 'clean' }
  | { kind: 'done' };

export type CardKind = Card['kind'];

/** What only the tablet knows: the shown findings and the student's choices. */
export interface FlowContext {
  /** Codes of the canal's open findings (local or server). */
  findingCodes: string[];
  /** The student tapped "Finish compaction" (kept on the tablet; no event records it). */
  compactionFinished: boolean;
  /** After a removed cone the student chose to re-place the spreader first. */
  replaceSpreader?: boolean;
}

/** Round to the 0.5 mm grid the ruler and the schema use. */
export function toHalf(mm: number): number {
  return Math.round(mm * 2) / 2;
}

/** Clamp a ruler centre into the schema's length range (0.5–40 mm). */
export function clampLength(mm: number): number {
  return Math.min(40, Math.max(0.5, toHalf(mm)));
}

const COMPACTION = new Set(['spreader.placed', 'accessory.placed', 'accessory.removed']);

/** A field of an event's data (parseEvent checked its type). */
function field<T>(e: LogEvent | undefined, key: string): T | undefined {
  return (e?.data as Record<string, unknown> | undefined)?.[key] as T | undefined;
}

/** The next card for one canal, from the rules core's reading of it (readCanal). */
export function nextCard(reading: CanalReading, ctx: FlowContext): Card {
  const { state } = reading.result;
  const live = reading.counted.filter((e) => e.canalId === reading.result.canalId);
  const tooth = state.setting !== 'block';
  const cwl = state.cwlMm;
  const has = (type: string, pred: (e: LogEvent) => boolean = () => true) =>
    live.some((e) => e.type === type && pred(e));
  const radiograph = (purpose: string) => (e: LogEvent) => field(e, 'purpose') === purpose;
  const indexOf = (e: LogEvent | undefined) => (e ? live.indexOf(e) : -1);

  if (!has('seat.checked')) return { kind: 'seat' };
  if (!has('taper.checked')) return { kind: 'taper', centre: clampLength(cwl - 1) };
  if (tooth && !has('radiograph.taken', radiograph('maf'))) return { kind: 'radiograph', purpose: 'maf' };
  if (!has('canal.rinsed')) return { kind: 'rinse' };
  if (!has('canal.dried')) return { kind: 'dry', centre: clampLength(cwl) };

  const fits = live.filter((e) => e.type === 'master.fitted');
  const lastFit = fits[fits.length - 1];
  if (!lastFit || field(lastFit, 'reachedLength') !== true) {
    return { kind: 'master', centre: clampLength(cwl), refit: fits.length > 0 };
  }
  if (tooth) {
    const firstFit = indexOf(fits[0]);
    const radiographAfterFit = live.some(
      (e, i) => i > firstFit && e.type === 'radiograph.taken' && field(e, 'purpose') === 'cone-fit',
    );
    if (!radiographAfterFit || ctx.findingCodes.includes('cone-fit-retake-needed')) {
      return { kind: 'radiograph', purpose: 'cone-fit' };
    }
  }
  if (!has('master.seated')) return { kind: 'seal' };

  const steps = live.filter((e) => COMPACTION.has(e.type));
  const lastStep = steps[steps.length - 1];
  const afterCompaction = (e: LogEvent) => indexOf(e) > indexOf(lastStep);
  const fillStarted =
    ctx.compactionFinished ||
    has('fill.assessed') ||
    has('gp.seared') ||
    live.some((e) => e.type === 'radiograph.taken' && field(e, 'purpose') === 'fill-check' && afterCompaction(e));

  if (!fillStarted) {
    // Kept cones and depths are the rules core's (CanalState), not a recount.
    const lastDepth = state.spreaderDepths[state.spreaderDepths.length - 1];
    const cycle = state.accessoryCones + 1;
    const spreaderCard = (): Card => ({
      kind: 'spreader',
      cycle,
      centre: clampLength(lastDepth ?? cwl - 2),
      complete: state.complete,
    });
    if (!lastStep) return spreaderCard();
    if (lastStep.type === 'spreader.placed') {
      return { kind: 'accessory', cycle, depthMm: field<number>(lastStep, 'depthMm') ?? cwl, redo: false };
    }
    if (lastStep.type === 'accessory.placed') {
      if (field(lastStep, 'reachedLength') === false) {
        return {
          kind: 'remove',
          eventId: lastStep.id,
          lengthMm: field<number>(lastStep, 'lengthMm') ?? 0,
          depthMm: lastDepth ?? field<number>(lastStep, 'lengthMm') ?? cwl,
        };
      }
      return spreaderCard();
    }
    // The last step removed a short cone: place another at the same depth, or re-place the spreader.
    if (ctx.replaceSpreader || lastDepth === undefined) return spreaderCard();
    return { kind: 'accessory', cycle, depthMm: lastDepth, redo: true };
  }

  if (!has('fill.assessed')) {
    const taken = live.some(
      (e) => e.type === 'radiograph.taken' && field(e, 'purpose') === 'fill-check' && afterCompaction(e),
    );
    return { kind: 'fill', radiographTaken: taken, needsRadiograph: tooth };
  }
  if (!has('gp.seared')) return { kind: 'sear' };
  if (!has('gp.compacted')) return { kind: 'compact' };
  if (!has('chamber.cleaned')) return { kind: 'clean' };
  return { kind: 'done' };
}

/** The lengths shown on a ruler: centre ± span in 0.5 mm steps, within [min, max]. */
export function rulerValues(centre: number, span: number, min = 0.5, max = 40): number[] {
  const lo = Math.max(min, toHalf(centre - span));
  const hi = Math.min(max, toHalf(centre + span));
  const out: number[] = [];
  for (let v = lo; v <= hi + 1e-9; v += 0.5) out.push(toHalf(v));
  return out;
}

/** The step titles used in the stepper's progress line. */
export const STEP_ORDER: CardKind[] = [
  'seat',
  'taper',
  'radiograph',
  'rinse',
  'dry',
  'master',
  'seal',
  'spreader',
  'accessory',
  'remove',
  'fill',
  'sear',
  'compact',
  'clean',
  'done',
];
