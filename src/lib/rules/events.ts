// The event envelope and the data of every event type in sync-contract.md, as zod schemas.
// The island, the outbox, the endpoints and the rules all validate with these.
import { z } from 'zod';
import * as f from './fields';

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
} satisfies Record<EventType, z.ZodRawShape>;

/** Events that must carry no canalId. */
export const CASE_LEVEL_ONLY: ReadonlySet<EventType> = new Set<EventType>(['case.opened', 'case.submitted']);
/**
 * Events that may be case-level or name a canal. `event.voided` is among them although the
 * issue's list leaves it out: without it a case-level `access.restored` or post-op radiograph
 * could never be undone. A void only counts for an event in its own scope (see timeline.ts).
 */
export const CASE_OR_CANAL: ReadonlySet<EventType> = new Set<EventType>(['access.restored', 'radiograph.taken', 'note.added', 'event.voided']);

const AT_MESSAGE = 'at must be an ISO 8601 instant with a time zone, such as 2026-12-02T09:41:07.250Z';
const at = z.unknown().transform((v, ctx) => {
  if (v === undefined || v === null) {
    ctx.addIssue({ code: z.ZodIssueCode.custom, message: 'at is required' });
    return z.NEVER;
  }
  if (typeof v !== 'string' || !z.string().datetime({ offset: true }).safeParse(v).success || !Number.isFinite(Date.parse(v))) {
    ctx.addIssue({ code: z.ZodIssueCode.custom, message: AT_MESSAGE });
    return z.NEVER;
  }
  return v;
});

function member<T extends EventType, S extends z.ZodRawShape>(type: T, shape: S) {
  const empty = Object.keys(shape).length === 0;
  const data = z.preprocess(
    (v) => (empty && (v === undefined || v === null) ? {} : v),
    z.object(shape, { required_error: 'data is required', invalid_type_error: 'data must be an object' }),
  );
  return z.object({
    id: f.uuid('id'),
    caseId: f.uuid('caseId'),
    canalId: f.optionalUuid('canalId'),
    type: z.literal(type),
    at,
    data,
  });
}

function union() {
  const d = DATA;
  return z.discriminatedUnion(
    'type',
    [
      member('case.opened', d['case.opened']), member('canal.added', d['canal.added']),
      member('canal.cwlCorrected', d['canal.cwlCorrected']), member('seat.checked', d['seat.checked']),
      member('taper.checked', d['taper.checked']), member('radiograph.taken', d['radiograph.taken']),
      member('canal.rinsed', d['canal.rinsed']), member('canal.dried', d['canal.dried']),
      member('master.fitted', d['master.fitted']), member('master.seated', d['master.seated']),
      member('spreader.placed', d['spreader.placed']), member('accessory.placed', d['accessory.placed']),
      member('accessory.removed', d['accessory.removed']), member('fill.assessed', d['fill.assessed']),
      member('gp.seared', d['gp.seared']), member('gp.compacted', d['gp.compacted']),
      member('chamber.cleaned', d['chamber.cleaned']), member('access.restored', d['access.restored']),
      member('note.added', d['note.added']), member('event.voided', d['event.voided']),
      member('case.submitted', d['case.submitted']),
    ],
    {
      errorMap: (issue, ctx) => {
        if (issue.code === z.ZodIssueCode.invalid_union_discriminator) {
          const t: unknown = ctx.data !== null && typeof ctx.data === 'object' ? (ctx.data as { type?: unknown }).type : undefined;
          if (t === undefined || t === null) return { message: 'type is required' };
          return { message: typeof t === 'string' ? `unknown event type ${JSON.stringify(t)}` : 'type must be an event type such as "spreader.placed"' };
        }
        if (issue.code === z.ZodIssueCode.invalid_type) return { message: 'the event must be an object' };
        return { message: ctx.defaultError };
      },
    },
  );
}

/** Cross-field checks: which events name a canal, and what a case needs for its setting. */
function crossFieldChecks(e: z.output<ReturnType<typeof union>>, ctx: z.RefinementCtx): void {
  const issue = (message: string, path: (string | number)[]) => ctx.addIssue({ code: z.ZodIssueCode.custom, message, path });
  if (CASE_LEVEL_ONLY.has(e.type)) {
    if (e.canalId !== undefined) issue(`canalId must be absent on ${e.type}, which is case-level`, ['canalId']);
  } else if (e.canalId === undefined) {
    const caseLevelAllowed =
      e.type === 'radiograph.taken' ? e.data.purpose === 'post-op' : CASE_OR_CANAL.has(e.type);
    if (!caseLevelAllowed) {
      const what = e.type === 'radiograph.taken' ? `radiograph.taken with purpose ${e.data.purpose}` : e.type;
      issue(`canalId is required on ${what}`, ['canalId']);
    }
  }
  if (e.type === 'case.opened') {
    const { setting, tooth, chartRef } = e.data;
    if (setting !== 'block' && tooth === undefined) issue(`tooth is required for ${setting === 'patient' ? 'a patient' : 'an extracted tooth'}`, ['data', 'tooth']);
    if (setting === 'patient' && (chartRef === undefined || chartRef === '')) issue('chartRef is required for a patient', ['data', 'chartRef']);
    if (setting !== 'patient' && chartRef !== undefined) issue('chartRef is allowed only for a patient', ['data', 'chartRef']);
  }
}

const baseEventSchema = union().superRefine(crossFieldChecks);

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

export type LogEvent = z.output<typeof eventSchema>;
export type EventOf<T extends EventType> = Extract<LogEvent, { type: T }>;

export { baseEventSchema };
