// Reading an object of fields (an event's envelope or its data) in one pass.
import { z } from 'zod';
import { Invalid, readField, type Field } from './fields';

export type Shape = Readonly<Record<string, Field<unknown>>>;

type ValueOf<F> = F extends Field<infer T, true> ? T | undefined : F extends Field<infer T, false> ? T : never;
/** The type z.object infers for the same fields: optional ones as `key?: T | undefined`. */
export type RecordOf<S extends Shape> = z.objectOutputType<{ [K in keyof S]: z.ZodType<ValueOf<S[K]>> }, z.ZodTypeAny, 'strip'>;

/**
 * Reads the fields of `shape` from `input` the way z.object over one schema per field did:
 * every field in order, unknown keys dropped, a key sent as undefined or null kept (as
 * undefined). Each problem becomes an issue at `[...path, key]`, and its field reads as z.NEVER.
 */
export function readRecord<S extends Shape>(shape: S, input: Record<string, unknown>, ctx: z.RefinementCtx, path: readonly string[]): RecordOf<S> {
  const out: Record<string, unknown> = {};
  for (const key in shape) {
    let value = readField(shape[key] as Field<unknown>, input[key]);
    if (value instanceof Invalid) {
      ctx.addIssue({ code: z.ZodIssueCode.custom, message: value.message, path: [...path, key] });
      value = z.NEVER;
    }
    if (value !== undefined || key in input) out[key] = value;
  }
  return out as RecordOf<S>;
}
