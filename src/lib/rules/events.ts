// The event envelope and the data of every event type in sync-contract.md, and the zod schema
// of an event. The island, the outbox, the endpoints and the rules all validate with it.
import { z } from 'zod';
import * as f from './fields';
import { readRecord, type RecordOf, type Shape } from './record';

export const EVENT_TYPES = [
  'case.opened', 'canal.added', 'canal.cwlCorrected', 'seat.checked', 'taper.checked',
  'radiograph.taken', 'canal.rinsed', 'canal.dried', 'master.fitted', 'master.seated',
  'spreader.placed', 'accessory.placed', 'accessory.removed', 'fill.assessed', 'gp.seared',
  'gp.compacted', 'chamber.cleaned', 'access.restored', 'note.added', 'event.voided',
  'case.submitted',
] as const;
export type EventType = (typeof EVENT_TYPES)[number];

export const SETTINGS = ['block', 'extracted', 'patient'] as const;
export const SEALERS = ['zoe', 'epoxy-resin', 'calcium-silicate', 'calcium-hydroxide', 'other'] as const;
export const RADIOGRAPH_PURPOSES = ['working-length', 'maf', 'cone-fit', 'fill-check', 'post-op'] as const;
export type RadiographPurpose = (typeof RADIOGRAPH_PURPOSES)[number];
export const FILL_LENGTHS = ['flush', 'short-0-2', 'short-over-2', 'beyond'] as const;

const TEXT_MAX = 2000;

/** Data of each event type. Unknown keys are dropped. */
const DATA = {
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
  'seat.checked': { fileSize: f.size('fileSize'), lengthMm: f.lengthMm('lengthMm'), result: f.oneOf('result', ['seated', 'advances', 'short'] as const) },
  'taper.checked': { spreader: f.size('spreader'), depthMm: f.lengthMm('depthMm') },
  'radiograph.taken': { purpose: f.oneOf('purpose', RADIOGRAPH_PURPOSES), radiographId: f.optionalText('radiographId', 200) },
  'canal.rinsed': { solutions: f.solutions('solutions') },
  'canal.dried': { pointSize: f.oneOf('pointSize', ['fine', 'medium', 'coarse'] as const), measuredMm: f.lengthMm('measuredMm') },
  'master.fitted': { size: f.size('size'), lengthMm: f.lengthMm('lengthMm'), reachedLength: f.bool('reachedLength'), tugBack: f.optionalBool('tugBack') },
  'master.seated': { sealer: f.oneOf('sealer', SEALERS) },
  'spreader.placed': { spreader: f.size('spreader'), depthMm: f.lengthMm('depthMm') },
  'accessory.placed': { size: f.size('size'), lengthMm: f.lengthMm('lengthMm'), reachedLength: f.bool('reachedLength') },
  'accessory.removed': { eventId: f.uuid('eventId'), reason: f.textMayBeEmpty('reason', TEXT_MAX) },
  'fill.assessed': { length: f.oneOf('length', FILL_LENGTHS), voids: f.bool('voids') },
  'gp.seared': { atOrifice: f.bool('atOrifice'), relativeToCejMm: f.optionalCejMm('relativeToCejMm') },
  'gp.compacted': {},
  // Not listed among the contract's free-text fields: trimmed, 1–60 characters (our choice).
  'chamber.cleaned': { agent: f.text('agent', 60) },
  'access.restored': { kind: f.oneOf('kind', ['temporary', 'permanent'] as const), material: f.optionalText('material', TEXT_MAX) },
  'note.added': { text: f.text('text', TEXT_MAX) },
  'event.voided': { eventId: f.uuid('eventId'), reason: f.textMayBeEmpty('reason', TEXT_MAX) },
  'case.submitted': {},
} satisfies Record<EventType, Shape>;

/** Events that must carry no canalId. */
export const CASE_LEVEL_ONLY: ReadonlySet<EventType> = new Set<EventType>(['case.opened', 'case.submitted']);
/**
 * Events that may be case-level or name a canal. `event.voided` is among them although the
 * issue's list leaves it out: without it a case-level `access.restored` or post-op radiograph
 * could never be undone. A void only counts for an event in its own scope (see timeline.ts).
 */
export const CASE_OR_CANAL: ReadonlySet<EventType> = new Set<EventType>(['access.restored', 'radiograph.taken', 'note.added', 'event.voided']);

/** The fields every event carries besides its type and data. */
const ENVELOPE = {
  id: f.uuid('id'),
  caseId: f.uuid('caseId'),
  canalId: f.optionalUuid('canalId'),
  at: f.instant('at'),
} satisfies Shape;

type EventFields<T extends EventType> = z.objectUtil.flatten<RecordOf<typeof ENVELOPE> & { type: T; data: RecordOf<(typeof DATA)[T]> }>;
/** One event, validated and normalised: a union on `type` that narrows `data`. */
export type LogEvent = { [T in EventType]: EventFields<T> }[EventType];
export type EventOf<T extends EventType> = Extract<LogEvent, { type: T }>;

// Why one transform for the whole event: zod 3 spends about 2 µs, and much garbage, on each
// transform or refinement it runs; one per field made parseEvent cost 30–40 µs an event, too
// slow for the sync endpoint (≥ 10,000 events/s). So zod checks that the event is an object and
// routes it by type, with the messages it always gave, and readEvent reads every field at once.

/** The keys of an event of `type`, as zod picks them out; readEvent checks their values. */
function envelopeOf<T extends EventType>(type: T) {
  return z.object({ id: z.unknown(), caseId: z.unknown(), canalId: z.unknown(), type: z.literal(type), at: z.unknown(), data: z.unknown() });
}
type Envelope = ReturnType<typeof envelopeOf<EventType>>;

const byType = z.discriminatedUnion('type', EVENT_TYPES.map(envelopeOf) as [Envelope, ...Envelope[]], {
  errorMap: (issue, ctx) => {
    if (issue.code === z.ZodIssueCode.invalid_union_discriminator) {
      const t: unknown = ctx.data !== null && typeof ctx.data === 'object' ? (ctx.data as { type?: unknown }).type : undefined;
      if (t === undefined || t === null) return { message: 'type is required' };
      return { message: typeof t === 'string' ? `unknown event type ${JSON.stringify(t)}` : 'type must be an event type such as "spreader.placed"' };
    }
    if (issue.code === z.ZodIssueCode.invalid_type) return { message: 'the event must be an object' };
    return { message: ctx.defaultError };
  },
});

const WITHOUT_DATA: ReadonlySet<EventType> = new Set(EVENT_TYPES.filter((t) => Object.keys(DATA[t]).length === 0));

/** Reads the fields of an event zod has routed; every problem becomes an issue at its path. */
function readEvent(raw: z.output<typeof byType>, ctx: z.RefinementCtx): LogEvent {
  const head = readRecord(ENVELOPE, raw, ctx, []);
  const { type } = raw;
  let data: unknown = raw.data;
  // A type without data may leave it out or send null.
  if (WITHOUT_DATA.has(type) && (data === undefined || data === null)) data = {};
  // zod's own idea of an object: not null, an array, a Date, a Map, a Set or a promise.
  const received = z.getParsedType(data);
  if (received !== z.ZodParsedType.object) {
    // The issue z.object gave, keys in the same order; no cross-field check runs without data.
    const message = data === undefined ? 'data is required' : 'data must be an object';
    ctx.addIssue({ code: z.ZodIssueCode.invalid_type, expected: z.ZodParsedType.object, received, path: ['data'], message });
    return z.NEVER;
  }
  const fields = readRecord(DATA[type], data as Record<string, unknown>, ctx, ['data']);
  const { id, caseId, canalId, at } = head;
  // Keys in the contract's order; canalId only when it was sent, as z.object kept it.
  const e = ('canalId' in head ? { id, caseId, canalId, type, at, data: fields } : { id, caseId, type, at, data: fields }) as LogEvent;
  crossFieldChecks(e, ctx);
  return e;
}

/** Cross-field checks: which events name a canal, and what a case needs for its setting. */
function crossFieldChecks(e: LogEvent, ctx: z.RefinementCtx): void {
  if (CASE_LEVEL_ONLY.has(e.type)) {
    if (e.canalId !== undefined) issue(ctx, `canalId must be absent on ${e.type}, which is case-level`, ['canalId']);
  } else if (e.canalId === undefined) {
    const caseLevelAllowed =
      e.type === 'radiograph.taken' ? e.data.purpose === 'post-op' : CASE_OR_CANAL.has(e.type);
    if (!caseLevelAllowed) {
      const what = e.type === 'radiograph.taken' ? `radiograph.taken with purpose ${e.data.purpose}` : e.type;
      issue(ctx, `canalId is required on ${what}`, ['canalId']);
    }
  }
  if (e.type === 'case.opened') {
    const { setting, tooth, chartRef } = e.data;
    if (setting !== 'block' && tooth === undefined) issue(ctx, `tooth is required for ${setting === 'patient' ? 'a patient' : 'an extracted tooth'}`, ['data', 'tooth']);
    if (setting === 'patient' && (chartRef === undefined || chartRef === '')) issue(ctx, 'chartRef is required for a patient', ['data', 'chartRef']);
    if (setting !== 'patient' && chartRef !== undefined) issue(ctx, 'chartRef is allowed only for a patient', ['data', 'chartRef']);
  }
}

// A plain function rather than a closure made for every event: on this path each one counts.
function issue(ctx: z.RefinementCtx, message: string, path: string[]): void {
  ctx.addIssue({ code: z.ZodIssueCode.custom, message, path });
}

const baseEventSchema = byType.transform(readEvent);

const DAY_MS = 24 * 60 * 60 * 1000;
export const FUTURE_AT_MESSAGE = 'at is more than a day ahead of the server clock';
/** True when `at` lies more than 24 h after `now`. */
export function isTooFarAhead(atIso: string, now: Date): boolean {
  const nowMs = now.getTime();
  return Number.isFinite(nowMs) && Date.parse(atIso) - nowMs > DAY_MS;
}

/**
 * One event, validated and normalised (sizes as strings, text trimmed, UUIDs lower-cased,
 * unknown keys dropped). The clock check uses this device's clock at parse time; call
 * parseEvent to pass the clock yourself.
 */
export const eventSchema = baseEventSchema.superRefine((e, ctx) => {
  if (isTooFarAhead(e.at, new Date())) ctx.addIssue({ code: z.ZodIssueCode.custom, message: FUTURE_AT_MESSAGE, path: ['at'] });
});

export { baseEventSchema };
