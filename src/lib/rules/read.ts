// Reading one raw event into a LogEvent, or the problems that stop it: plain code, for
// parseEvent (the chairside island checks every tap with it, the server every synced event).
import { CASE_LEVEL_ONLY, CASE_OR_CANAL, DATA, ENVELOPE, EVENT_TYPES, type EventType, type LogEvent } from './events';
import { parsedType, readRecord, type Issue } from './record';

export const NOT_AN_OBJECT = 'the event must be an object';

/** What is wrong with `type` when it names no event type. */
export function typeProblem(type: unknown): string {
  if (type === undefined || type === null) return 'type is required';
  return typeof type === 'string'
    ? `unknown event type ${JSON.stringify(type)}`
    : 'type must be an event type such as "spreader.placed"';
}

export type Reading = { ok: true; event: LogEvent } | { ok: false; issues: Issue[] };

const TYPES: ReadonlySet<unknown> = new Set(EVENT_TYPES);

/**
 * Reads a raw event. Problems come in the order zod's discriminated union on `type` gave
 * them: not an object, then no known type (each stops the reading), then those of readTyped.
 */
export function readEvent(raw: unknown): Reading {
  const received = parsedType(raw);
  if (received !== 'object') {
    return {
      ok: false,
      issues: [{ code: 'invalid_type', expected: 'object', received, path: [], message: NOT_AN_OBJECT }],
    };
  }
  const input = raw as Record<string, unknown>;
  const type = input.type;
  if (!TYPES.has(type)) {
    return {
      ok: false,
      issues: [
        { code: 'invalid_union_discriminator', options: [...EVENT_TYPES], path: ['type'], message: typeProblem(type) },
      ],
    };
  }
  const issues: Issue[] = [];
  const event = readTyped(input, type as EventType, issues);
  return event !== undefined && issues.length === 0 ? { ok: true, event } : { ok: false, issues };
}

const WITHOUT_DATA: ReadonlySet<EventType> = new Set(EVENT_TYPES.filter((t) => Object.keys(DATA[t]).length === 0));

/**
 * Reads the fields of an event of a known `type`, adding every problem to `issues`: the
 * envelope, then data, then the cross-field checks. Undefined when data is not an object (no
 * cross-field check runs without it); otherwise the event, whose unreadable fields hold
 * UNREADABLE when `issues` is not empty.
 */
export function readTyped(input: Record<string, unknown>, type: EventType, issues: Issue[]): LogEvent | undefined {
  const head = readRecord(ENVELOPE, input, issues, []);
  let data: unknown = input.data;
  // A type without data may leave it out or send null.
  if (WITHOUT_DATA.has(type) && (data === undefined || data === null)) data = {};
  // zod's idea of an object: not null, an array, a Date, a Map, a Set or a promise.
  const received = parsedType(data);
  if (received !== 'object') {
    // The issue z.object gave, keys in the same order.
    const message = data === undefined ? 'data is required' : 'data must be an object';
    issues.push({ code: 'invalid_type', expected: 'object', received, path: ['data'], message });
    return undefined;
  }
  const fields = readRecord(DATA[type], data as Record<string, unknown>, issues, ['data']);
  const { id, caseId, canalId, at } = head;
  // Keys in the contract's order; canalId only when it was sent, as z.object kept it.
  const e = (
    'canalId' in head ? { id, caseId, canalId, type, at, data: fields } : { id, caseId, type, at, data: fields }
  ) as LogEvent;
  crossFieldChecks(e, issues);
  return e;
}

/** Cross-field checks: which events name a canal, and what a case needs for its setting. */
function crossFieldChecks(e: LogEvent, issues: Issue[]): void {
  if (CASE_LEVEL_ONLY.has(e.type)) {
    if (e.canalId !== undefined) issue(issues, `canalId must be absent on ${e.type}, which is case-level`, ['canalId']);
  } else if (e.canalId === undefined) {
    const caseLevelAllowed = e.type === 'radiograph.taken' ? e.data.purpose === 'post-op' : CASE_OR_CANAL.has(e.type);
    if (!caseLevelAllowed) {
      const what = e.type === 'radiograph.taken' ? `radiograph.taken with purpose ${e.data.purpose}` : e.type;
      issue(issues, `canalId is required on ${what}`, ['canalId']);
    }
  }
  if (e.type === 'case.opened') {
    const { setting, tooth, chartRef } = e.data;
    if (setting !== 'block' && tooth === undefined)
      issue(issues, `tooth is required for ${setting === 'patient' ? 'a patient' : 'an extracted tooth'}`, [
        'data',
        'tooth',
      ]);
    if (setting === 'patient' && (chartRef === undefined || chartRef === ''))
      issue(issues, 'chartRef is required for a patient', ['data', 'chartRef']);
    if (setting !== 'patient' && chartRef !== undefined)
      issue(issues, 'chartRef is allowed only for a patient', ['data', 'chartRef']);
  }
}

function issue(issues: Issue[], message: string, path: string[]): void {
  issues.push({ code: 'custom', message, path });
}
