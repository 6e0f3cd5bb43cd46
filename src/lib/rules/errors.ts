// The one helper that turns validation errors into the sentence a person sees.
import { z } from 'zod';

/** The field a path points at, as the contract names it ("data.depthMm" → "depthMm"). */
function fieldName(path: readonly (string | number)[]): string {
  for (let i = path.length - 1; i >= 0; i--) {
    const p = path[i];
    if (typeof p === 'string') return p;
  }
  return 'the event';
}

function describeExpected(expected: string): string {
  switch (expected) {
    case 'number':
      return 'a number';
    case 'string':
      return 'text';
    case 'boolean':
      return 'true or false';
    case 'object':
      return 'an object';
    case 'array':
      return 'a list';
    default:
      return expected;
  }
}

/**
 * One plain sentence for the first problem found, naming the field and what is allowed,
 * e.g. "depthMm must be a multiple of 0.5 mm". Messages the schemas wrote themselves are kept
 * as they are; zod's generic ones are rewritten.
 */
export function formatZodError(err: z.ZodError): string {
  const issue = err.issues[0];
  if (issue === undefined) return 'the event is not valid';
  const generic = z.defaultErrorMap(issue, { defaultError: issue.message, data: undefined }).message;
  if (issue.message !== generic) return issue.message;
  const name = fieldName(issue.path);
  switch (issue.code) {
    case z.ZodIssueCode.invalid_type:
      return issue.received === 'undefined' || issue.received === 'null'
        ? `${name} is required`
        : `${name} must be ${describeExpected(issue.expected)}`;
    case z.ZodIssueCode.invalid_literal:
      return `${name} must be ${JSON.stringify(issue.expected)}`;
    case z.ZodIssueCode.invalid_enum_value:
      return `${name} must be one of ${issue.options.join(', ')}`;
    case z.ZodIssueCode.too_small:
      return issue.type === 'string'
        ? `${name} must not be empty`
        : `${name} must be at least ${String(issue.minimum)}`;
    case z.ZodIssueCode.too_big:
      return issue.type === 'string'
        ? `${name} must be at most ${String(issue.maximum)} characters`
        : `${name} must be at most ${String(issue.maximum)}`;
    case z.ZodIssueCode.unrecognized_keys:
      return `${name} has fields that are not allowed: ${issue.keys.join(', ')}`;
    default:
      return `${name} is not valid`;
  }
}
