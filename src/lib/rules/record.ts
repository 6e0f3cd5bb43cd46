// Reading an object of fields (an event's envelope or its data) in one pass, and the problems
// found on the way. Plain code, no zod: it runs on every tap and every synced event.
import { Invalid, readField, type Field } from './fields';

/** zod's names for what a value is (z.getParsedType), as an issue reports them. */
export type ParsedType =
  | 'string'
  | 'nan'
  | 'number'
  | 'integer'
  | 'float'
  | 'boolean'
  | 'date'
  | 'bigint'
  | 'symbol'
  | 'function'
  | 'undefined'
  | 'null'
  | 'array'
  | 'object'
  | 'unknown'
  | 'promise'
  | 'void'
  | 'never'
  | 'map'
  | 'set';

/** One problem with an event: where it is, and a sentence of ours saying what is wrong. */
export type Issue =
  | { code: 'custom'; path: string[]; message: string }
  | { code: 'invalid_type'; expected: 'object'; received: ParsedType; path: string[]; message: string }
  | { code: 'invalid_union_discriminator'; options: string[]; path: string[]; message: string };

export type Shape = Readonly<Record<string, Field<unknown>>>;

type ValueOf<F> = F extends Field<infer T, true> ? T | undefined : F extends Field<infer T, false> ? T : never;
type OptionalKeys<S> = { [K in keyof S]: S[K] extends Field<unknown, true> ? K : never }[keyof S];
/** Spreads an intersection into one object type, as editors show it. */
export type Flatten<T> = { [K in keyof T]: T[K] } & {};
/** The type z.object inferred for the same fields: optional ones as `key?: T | undefined`. */
export type RecordOf<S extends Shape> = Flatten<
  { [K in Exclude<keyof S, OptionalKeys<S>>]: ValueOf<S[K]> } & { [K in OptionalKeys<S>]?: ValueOf<S[K]> }
>;

/**
 * What a field that could not be read holds while the rest of the event is read (zod's
 * z.NEVER, a frozen object): the cross-field checks still run and see it as "given, not
 * undefined", so the same problems are reported as before. Never returned in an event.
 */
export const UNREADABLE: unknown = Object.freeze({ status: 'aborted' });

/**
 * Reads the fields of `shape` from `input` the way z.object over one schema per field did:
 * every field in order, unknown keys dropped, a key sent as undefined or null kept (as
 * undefined). Each problem is added to `issues` at `[...path, key]`.
 */
export function readRecord<S extends Shape>(
  shape: S,
  input: Record<string, unknown>,
  issues: Issue[],
  path: readonly string[],
): RecordOf<S> {
  const out: Record<string, unknown> = {};
  for (const key in shape) {
    let value = readField(shape[key] as Field<unknown>, input[key]);
    if (value instanceof Invalid) {
      issues.push({ code: 'custom', message: value.message, path: [...path, key] });
      value = UNREADABLE;
    }
    if (value !== undefined || key in input) out[key] = value;
  }
  return out as RecordOf<S>;
}

/** What zod 3 calls a value (its getParsedType, copied): "object" only for a plain kind of object. */
export function parsedType(v: unknown): ParsedType {
  switch (typeof v) {
    case 'undefined':
      return 'undefined';
    case 'string':
      return 'string';
    case 'number':
      return Number.isNaN(v) ? 'nan' : 'number';
    case 'boolean':
      return 'boolean';
    case 'function':
      return 'function';
    case 'bigint':
      return 'bigint';
    case 'symbol':
      return 'symbol';
    case 'object': {
      if (Array.isArray(v)) return 'array';
      if (v === null) return 'null';
      const o = v as { then?: unknown; catch?: unknown };
      if (o.then && typeof o.then === 'function' && o.catch && typeof o.catch === 'function') return 'promise';
      if (v instanceof Map) return 'map';
      if (v instanceof Set) return 'set';
      if (v instanceof Date) return 'date';
      return 'object';
    }
    default:
      return 'unknown';
  }
}
