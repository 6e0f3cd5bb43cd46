// Fields of events. Each one writes its own message, naming the field and what is allowed,
// so that formatZodError can show it to a person as it is.
//
// A field is a plain check, not a zod schema of its own: parseEvent runs on every synced event
// (the server must take ≥ 10,000 a second) and zod 3 spends about 2 µs, and much garbage, on
// each transform it runs; so read.ts reads all the fields of an event in one pass (see record.ts).
// No zod here: this file is part of the rules core the chairside island bundles (see core.ts).
import { normaliseSize, SIZE_RULE_TEXT } from './sizes';
import { isValidFdi } from './teeth';

/** What a check returns for a value it refuses: the sentence a person sees. */
export class Invalid {
  constructor(readonly message: string) {}
}
const no = (message: string): Invalid => new Invalid(message);

/** Reads a given value (not undefined or null) into its normalised form, or refuses it. */
type Check<T> = (v: unknown) => T | Invalid;

/** One field: its check, and what to say when it is absent or null (nothing, if optional). */
export interface Field<T, Optional extends boolean = boolean> {
  readonly check: Check<T>;
  readonly missing: Optional extends true ? undefined : string;
}

/** A required field whose parsing and message are entirely ours. */
function field<T>(name: string, check: Check<T>): Field<T, false> {
  return { check, missing: `${name} is required` };
}

/** An optional field: absent or null means "not given". */
function optionalField<T>(check: Check<T>): Field<T, true> {
  return { check, missing: undefined };
}

/** Reads one field: its value, undefined for an optional field not given, or what is wrong. */
export function readField<T>(f: Field<T>, v: unknown): T | undefined | Invalid {
  if (v === undefined || v === null) return f.missing === undefined ? undefined : no(f.missing);
  return f.check(v);
}

function mmCheck(name: string, min: number, max: number): Check<number> {
  return (v) => {
    if (typeof v !== 'number' || !Number.isFinite(v)) return no(`${name} must be a number of millimetres`);
    if (v < min || v > max) return no(`${name} must be between ${min} and ${max} mm`);
    if (!Number.isInteger(v * 2)) return no(`${name} must be a multiple of 0.5 mm`);
    return v === 0 ? 0 : v; // -0 → 0, so that canonical JSON does not depend on the sign of zero
  };
}

/** A length from the reference point (cwlMm, lengthMm, depthMm, measuredMm): 0.5–40 mm in 0.5 mm steps. */
export const lengthMm = (name: string) => field(name, mmCheck(name, 0.5, 40));
/** orificeDepthMm: 0–20 mm in 0.5 mm steps. */
export const optionalOrificeMm = (name: string) => optionalField(mmCheck(name, 0, 20));
/** relativeToCejMm: −5 to +5 mm in 0.5 mm steps (negative = above the CEJ). */
export const optionalCejMm = (name: string) => optionalField(mmCheck(name, -5, 5));

const sizeCheck =
  (name: string): Check<string> =>
  (v) =>
    normaliseSize(v) ?? no(`${name} must be ${SIZE_RULE_TEXT}`);
export const size = (name: string) => field(name, sizeCheck(name));
export const optionalSize = (name: string) => optionalField(sizeCheck(name));

export function oneOf<const T extends readonly string[]>(name: string, values: T) {
  return field(name, (v): T[number] | Invalid =>
    typeof v === 'string' && (values as readonly string[]).includes(v)
      ? (v as T[number])
      : no(`${name} must be one of ${values.join(', ')}`),
  );
}
export function optionalOneOf<const T extends readonly string[]>(name: string, values: T) {
  return optionalField((v): T[number] | Invalid =>
    typeof v === 'string' && (values as readonly string[]).includes(v)
      ? (v as T[number])
      : no(`${name} must be one of ${values.join(', ')}`),
  );
}

const boolCheck =
  (name: string): Check<boolean> =>
  (v) =>
    typeof v === 'boolean' ? v : no(`${name} must be true or false`);
export const bool = (name: string) => field(name, boolCheck(name));
export const optionalBool = (name: string) => optionalField(boolCheck(name));

const textCheck =
  (name: string, max: number, allowEmpty: boolean): Check<string> =>
  (v) => {
    if (typeof v !== 'string') return no(`${name} must be text`);
    const s = v.trim();
    if (!allowEmpty && s.length === 0) return no(`${name} must not be empty`);
    if (s.length > max) return no(`${name} must be at most ${max.toLocaleString('en-GB')} characters`);
    return s;
  };
/** Free text, trimmed and length-limited; required and not empty. */
export const text = (name: string, max: number) => field(name, textCheck(name, max, false));
/** Free text that must be present but may be empty (a reason the tablet may leave blank). */
export const textMayBeEmpty = (name: string, max: number) => field(name, textCheck(name, max, true));
export const optionalText = (name: string, max: number) => optionalField(textCheck(name, max, true));

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const uuidCheck =
  (name: string): Check<string> =>
  (v) =>
    typeof v === 'string' && UUID.test(v) ? v.toLowerCase() : no(`${name} must be a UUID`);
/** A UUID, lower-cased (UUIDs are case-insensitive; one spelling keeps duplicates recognisable). */
export const uuid = (name: string) => field(name, uuidCheck(name));
export const optionalUuid = (name: string) => optionalField(uuidCheck(name));

// zod 3's pattern for z.string().datetime({ offset: true }) (its datetimeRegex with precision
// null, offset true, local false), written out so the browser need not load zod for it: a date
// with leap years, hh:mm with optional seconds and fraction, then Z or ±hh[:]mm.
// tests/lib/rules/parse-agreement.test.ts checks it is still the regex zod builds.
export const ISO_INSTANT =
  /^((\d\d[2468][048]|\d\d[13579][26]|\d\d0[48]|[02468][048]00|[13579][26]00)-02-29|\d{4}-((0[13578]|1[02])-(0[1-9]|[12]\d|3[01])|(0[469]|11)-(0[1-9]|[12]\d|30)|(02)-(0[1-9]|1\d|2[0-8])))T([01]\d|2[0-3]):[0-5]\d(:[0-5]\d(\.\d+)?)?(Z|([+-]\d{2}:?\d{2}))$/;
/**
 * Digits allowed after the seconds: milliseconds, what `Date` keeps and `toISOString` writes.
 * More would be dropped by every reader, and an `at` of any length would not fit the 30
 * characters the events table keeps for it.
 */
export const AT_FRACTION_DIGITS = 3;
const LONG_FRACTION = new RegExp(`:\\d\\d\\.\\d{${AT_FRACTION_DIGITS + 1},}`);
/**
 * An instant in ISO 8601 with a time zone (Z or an offset), kept as written; at most
 * AT_FRACTION_DIGITS digits after the seconds (the pattern itself is zod's, which takes any number).
 */
export const instant = (name: string) =>
  field(name, (v): string | Invalid => {
    if (typeof v !== 'string' || !ISO_INSTANT.test(v) || !Number.isFinite(Date.parse(v))) {
      return no(`${name} must be an ISO 8601 instant with a time zone, such as 2026-12-02T09:41:07.250Z`);
    }
    if (LONG_FRACTION.test(v)) {
      return no(
        `${name} may have at most ${AT_FRACTION_DIGITS} digits after the seconds (milliseconds), such as 2026-12-02T09:41:07.250Z`,
      );
    }
    return v;
  });

export const FDI_RULE_TEXT =
  'an FDI tooth number (quadrants 1–4 with teeth 1–8, or primary quadrants 5–8 with teeth 1–5)';
export const optionalTooth = (name: string) =>
  optionalField((v): number | Invalid =>
    typeof v === 'number' && isValidFdi(v) ? v : no(`${name} must be ${FDI_RULE_TEXT}`),
  );

/**
 * Preparation: "step-back" or a fixed taper written "0.02"–"0.12". A number such as 0.04 is
 * read as "0.04", the way sizes are read (our decision; the contract shows the taper as 0.04).
 */
export const preparation = (name: string) =>
  field(name, (v): string | Invalid => {
    const s = typeof v === 'number' && Number.isFinite(v) ? v.toFixed(2) : v;
    if (s === 'step-back') return s;
    if (typeof s === 'string' && /^0\.(0[2-9]|1[0-2])$/.test(s) && (typeof v === 'string' || Number(s) === v)) return s;
    return no(`${name} must be "step-back" or a taper from 0.02 to 0.12 such as 0.04`);
  });

/**
 * A user's id as the server numbers its accounts (`GET /api/me` answers it), written as a
 * string of digits ("4"); the number 4 is read as "4", the way sizes are read.
 */
export const userRef = (name: string) =>
  field(name, (v): string | Invalid => {
    const s = typeof v === 'number' && Number.isSafeInteger(v) ? String(v) : v;
    return typeof s === 'string' && /^[1-9]\d{0,14}$/.test(s) ? s : no(`${name} must be the id of a user, such as "4"`);
  });

export const SOLUTIONS = ['naocl', 'edta', 'saline', 'chlorhexidine'] as const;
/** Rinse solutions: a non-empty list, duplicates dropped, the order kept. */
export const solutions = (name: string) =>
  field(name, (v): (typeof SOLUTIONS)[number][] | Invalid => {
    const message = `${name} must list one or more of ${SOLUTIONS.join(', ')}`;
    if (!Array.isArray(v) || v.length === 0) return no(message);
    const out: (typeof SOLUTIONS)[number][] = [];
    for (const s of v) {
      if (typeof s !== 'string' || !(SOLUTIONS as readonly string[]).includes(s)) return no(message);
      const known = s as (typeof SOLUTIONS)[number];
      if (!out.includes(known)) out.push(known);
    }
    return out;
  });
