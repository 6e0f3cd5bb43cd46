/** Turning an API refusal into what a react-hook-form form shows: beside its field, or above the button. */
import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import type { Reply } from './api';

/**
 * Puts a refusal beside the field it names when the form has that field; answers the message
 * to show for the whole form otherwise (null when it went beside a field).
 */
export function showRefusal<V extends FieldValues>(
  reply: Reply<unknown>,
  setError: UseFormSetError<V>,
  fields: readonly Path<V>[],
): string | null {
  const message = reply.error?.error ?? 'Something went wrong; nothing was changed.';
  const field = reply.error?.field as Path<V> | undefined;
  if (field && fields.includes(field)) {
    setError(field, { type: 'server', message }, { shouldFocus: true });
    return null;
  }
  return message;
}

/** A select's value as a row id, or null for "none". */
export const idOrNull = (v: unknown): number | null => (v === '' || v === null || v === undefined ? null : Number(v));
