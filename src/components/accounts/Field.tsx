/** A labelled input with its error beside it, for the account and invitation forms. */
import { useSyncExternalStore, type InputHTMLAttributes, type ReactNode } from 'react';
import type { UseFormRegisterReturn } from 'react-hook-form';

export const INPUT_CLASS = 'font-normal border-2 border-ink rounded px-3 py-3 text-lg';
export const BUTTON_CLASS =
  'bg-gutta-strong text-white font-bold rounded px-4 py-3 text-lg min-h-14 disabled:opacity-60';

interface Props extends Omit<InputHTMLAttributes<HTMLInputElement>, 'name'> {
  label: string;
  registration: UseFormRegisterReturn;
  error?: string | undefined;
  hint?: ReactNode;
}

export function Field({ label, registration, error, hint, id, ...input }: Props) {
  const fieldId = id ?? `field-${registration.name}`;
  const hintId = hint ? `${fieldId}-hint` : undefined;
  const errorId = `${fieldId}-error`;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={fieldId} className="font-bold">
        {label}
      </label>
      {hint && (
        <p id={hintId} className="text-sm text-muted">
          {hint}
        </p>
      )}
      <input
        id={fieldId}
        className={INPUT_CLASS}
        aria-invalid={error ? true : undefined}
        aria-describedby={[hintId, errorId].filter(Boolean).join(' ')}
        {...input}
        {...registration}
      />
      <FieldError id={errorId} message={error} />
    </div>
  );
}

/** The error line beside a field; always present so the layout does not jump. */
export function FieldError({ id, message }: { id: string; message?: string | undefined }) {
  return (
    <p id={id} className="text-stop min-h-6" data-error>
      {message ?? ''}
    </p>
  );
}

/** A form-wide message: a refusal that is about no one field, or the outcome. */
export function FormMessage({ message, tone }: { message?: string | undefined; tone: 'error' | 'done' }) {
  if (!message) return null;
  return tone === 'error' ? (
    <p role="alert" className="p-3 border-l-4 border-stop bg-paper text-stop font-bold">
      {message}
    </p>
  ) : (
    <p role="status" className="p-3 border-l-4 border-note bg-paper">
      {message}
    </p>
  );
}

const noSubscription = () => () => {};

/**
 * False in the server's HTML and until the island has hydrated, true after. Submit buttons
 * stay disabled until then: a form sent before its script runs would go as a plain browser
 * form, passwords included, instead of through the island.
 */
export function useHydrated(): boolean {
  return useSyncExternalStore(
    noSubscription,
    () => true,
    () => false,
  );
}
