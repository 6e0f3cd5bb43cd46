// The zod schema of an event, for code that composes zod schemas. It reads with the same
// field definitions and reader as parseEvent (read.ts), so both accept the same events and
// give the same first problem. Kept out of core.ts: the chairside island must not load zod.
import { z } from 'zod';
import { EVENT_TYPES, FUTURE_AT_MESSAGE, isTooFarAhead, type EventType, type LogEvent } from './events';
import { NOT_AN_OBJECT, readTyped, typeProblem } from './read';
import type { Issue } from './record';

// Why one transform for the whole event: zod 3 spends about 2 µs, and much garbage, on each
// transform or refinement it runs. So zod checks that the event is an object and routes it by
// type, with the messages parseEvent gives, and readTyped reads every field at once.

/** The keys of an event of `type`, as zod picks them out; readTyped checks their values. */
function envelopeOf<T extends EventType>(type: T) {
  return z.object({
    id: z.unknown(),
    caseId: z.unknown(),
    canalId: z.unknown(),
    type: z.literal(type),
    at: z.unknown(),
    data: z.unknown(),
  });
}
type Envelope = ReturnType<typeof envelopeOf<EventType>>;

const byType = z.discriminatedUnion('type', EVENT_TYPES.map(envelopeOf) as [Envelope, ...Envelope[]], {
  errorMap: (issue, ctx) => {
    if (issue.code === z.ZodIssueCode.invalid_union_discriminator) {
      const data: unknown = ctx.data;
      return {
        message: typeProblem(data !== null && typeof data === 'object' ? (data as { type?: unknown }).type : undefined),
      };
    }
    if (issue.code === z.ZodIssueCode.invalid_type) return { message: NOT_AN_OBJECT };
    return { message: ctx.defaultError };
  },
});

/**
 * One event, validated and normalised (sizes as strings, text trimmed, UUIDs lower-cased,
 * unknown keys dropped). The clock check uses this device's clock at parse time; call
 * parseEvent to pass the clock yourself.
 */
export const eventSchema = byType.transform((raw, ctx): LogEvent => {
  const issues: Issue[] = [];
  const e = readTyped(raw, raw.type, issues);
  for (const i of issues) ctx.addIssue(i);
  // The clock is checked after the other problems, and also when some were found (as the
  // superRefine this replaces did), but only on an `at` that could be read.
  if (e !== undefined && typeof e.at === 'string' && isTooFarAhead(e.at, new Date())) {
    ctx.addIssue({ code: z.ZodIssueCode.custom, message: FUTURE_AT_MESSAGE, path: ['at'] });
  }
  return e ?? z.NEVER;
});
