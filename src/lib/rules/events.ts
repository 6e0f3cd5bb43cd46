// The event envelope and the data of every event type in docs/sync-contract.md: the one set of
// field definitions. read.ts reads an event with them (for parseEvent, in the browser and on
// the server). No zod here, so the chairside island does not load it (see core.ts).
import * as f from './fields';
import type { Flatten, RecordOf, Shape } from './record';

export const EVENT_TYPES = [
  'case.opened',
  'canal.added',
  'canal.cwlCorrected',
  'seat.checked',
  'taper.checked',
  'radiograph.taken',
  'canal.rinsed',
  'canal.dried',
  'master.fitted',
  'master.seated',
  'spreader.placed',
  'accessory.placed',
  'accessory.removed',
  'fill.assessed',
  'gp.seared',
  'gp.compacted',
  'chamber.cleaned',
  'access.restored',
  'note.added',
  'event.voided',
  'case.submitted',
  // Contract version 2 (docs/sync-contract.md): appended, never reordered.
  'compaction.finished',
  'case.discarded',
  // Contract version 3: the cone-fit check at the chair (docs/review.md).
  'conefit.requested',
  'conefit.approvedAtChair',
] as const;
export type EventType = (typeof EVENT_TYPES)[number];

export const SETTINGS = ['block', 'extracted', 'patient'] as const;
export const SEALERS = ['zoe', 'epoxy-resin', 'calcium-silicate', 'calcium-hydroxide', 'other'] as const;
export const RADIOGRAPH_PURPOSES = ['working-length', 'maf', 'cone-fit', 'fill-check', 'post-op'] as const;
export type RadiographPurpose = (typeof RADIOGRAPH_PURPOSES)[number];
export const FILL_LENGTHS = ['flush', 'short-0-2', 'short-over-2', 'beyond'] as const;

const TEXT_MAX = 2000;

/** Data of each event type. Unknown keys are dropped. */
export const DATA = {
  'case.opened': {
    setting: f.oneOf('setting', SETTINGS),
    tooth: f.optionalTooth('tooth'),
    // Not listed among the contract's free-text fields: trimmed and limited to 64 (our choice).
    chartRef: f.optionalText('chartRef', 64),
  },
  'canal.added': {
    name: f.text('name', 12),
    referencePoint: f.text('referencePoint', 60),
    cwlMm: f.lengthMm('cwlMm'),
    mafSize: f.size('mafSize'),
    preparation: f.preparation('preparation'),
    orificeDepthMm: f.optionalOrificeMm('orificeDepthMm'),
    spreader: f.optionalSize('spreader'),
    accessorySize: f.optionalSize('accessorySize'),
    sealer: f.optionalOneOf('sealer', SEALERS),
  },
  'canal.cwlCorrected': { cwlMm: f.lengthMm('cwlMm'), reason: f.textMayBeEmpty('reason', TEXT_MAX) },
  'seat.checked': {
    fileSize: f.size('fileSize'),
    lengthMm: f.lengthMm('lengthMm'),
    result: f.oneOf('result', ['seated', 'advances', 'short'] as const),
  },
  'taper.checked': { spreader: f.size('spreader'), depthMm: f.lengthMm('depthMm') },
  'radiograph.taken': {
    purpose: f.oneOf('purpose', RADIOGRAPH_PURPOSES),
    radiographId: f.optionalText('radiographId', 200),
  },
  'canal.rinsed': { solutions: f.solutions('solutions') },
  'canal.dried': {
    pointSize: f.oneOf('pointSize', ['fine', 'medium', 'coarse'] as const),
    measuredMm: f.lengthMm('measuredMm'),
  },
  'master.fitted': {
    size: f.size('size'),
    lengthMm: f.lengthMm('lengthMm'),
    reachedLength: f.bool('reachedLength'),
    tugBack: f.optionalBool('tugBack'),
  },
  'master.seated': { sealer: f.oneOf('sealer', SEALERS) },
  'spreader.placed': { spreader: f.size('spreader'), depthMm: f.lengthMm('depthMm') },
  'accessory.placed': {
    size: f.size('size'),
    lengthMm: f.lengthMm('lengthMm'),
    reachedLength: f.bool('reachedLength'),
  },
  'accessory.removed': { eventId: f.uuid('eventId'), reason: f.textMayBeEmpty('reason', TEXT_MAX) },
  'fill.assessed': { length: f.oneOf('length', FILL_LENGTHS), voids: f.bool('voids') },
  'gp.seared': { atOrifice: f.bool('atOrifice'), relativeToCejMm: f.optionalCejMm('relativeToCejMm') },
  'gp.compacted': {},
  // Not listed among the contract's free-text fields: trimmed, 1–60 characters (our choice).
  'chamber.cleaned': { agent: f.text('agent', 60) },
  'access.restored': {
    kind: f.oneOf('kind', ['temporary', 'permanent'] as const),
    material: f.optionalText('material', TEXT_MAX),
  },
  'note.added': { text: f.text('text', TEXT_MAX) },
  'event.voided': { eventId: f.uuid('eventId'), reason: f.textMayBeEmpty('reason', TEXT_MAX) },
  'case.submitted': {},
  'compaction.finished': {},
  'case.discarded': { reason: f.text('reason', TEXT_MAX) },
  'conefit.requested': {},
  'conefit.approvedAtChair': { attendingId: f.userRef('attendingId') },
} satisfies Record<EventType, Shape>;

/** Events that must carry no canalId. */
export const CASE_LEVEL_ONLY: ReadonlySet<EventType> = new Set<EventType>([
  'case.opened',
  'case.submitted',
  'case.discarded',
]);
/**
 * Events that may be case-level or name a canal. `event.voided` is among them although the
 * issue's list leaves it out: without it a case-level `access.restored` or post-op radiograph
 * could never be undone. A void only counts for an event in its own scope (see timeline.ts).
 */
export const CASE_OR_CANAL: ReadonlySet<EventType> = new Set<EventType>([
  'access.restored',
  'radiograph.taken',
  'note.added',
  'event.voided',
]);

/** The fields every event carries besides its type and data. */
export const ENVELOPE = {
  id: f.uuid('id'),
  caseId: f.uuid('caseId'),
  canalId: f.optionalUuid('canalId'),
  at: f.instant('at'),
} satisfies Shape;

type EventFields<T extends EventType> = Flatten<
  RecordOf<typeof ENVELOPE> & { type: T; data: RecordOf<(typeof DATA)[T]> }
>;
/** One event, validated and normalised: a union on `type` that narrows `data`. */
export type LogEvent = { [T in EventType]: EventFields<T> }[EventType];
export type EventOf<T extends EventType> = Extract<LogEvent, { type: T }>;

const DAY_MS = 24 * 60 * 60 * 1000;
export const FUTURE_AT_MESSAGE = 'at is more than a day ahead of the server clock';
/** True when `at` lies more than 24 h after `now`. */
export function isTooFarAhead(atIso: string, now: Date): boolean {
  const nowMs = now.getTime();
  return Number.isFinite(nowMs) && Date.parse(atIso) - nowMs > DAY_MS;
}
