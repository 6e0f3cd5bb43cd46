/** Small pieces the director's screens share: control styles, a field's error, a form's answer. */
import type { ReactNode } from 'react';

export const BUTTON = 'bg-gutta-strong text-white font-bold rounded px-4 min-h-12 disabled:opacity-60';
export const BUTTON_QUIET = 'bg-white border-2 border-ink font-bold rounded px-4 min-h-12 disabled:opacity-60';
export const BUTTON_DANGER = 'bg-stop text-white font-bold rounded px-4 min-h-12 disabled:opacity-60';
export const CONTROL = 'border-2 border-edge rounded px-3 min-h-12 text-base bg-white';

/** The error beside a field; its id is what the field's aria-describedby names. */
export function FieldError({ id, message }: { id: string; message: string | undefined }) {
  return message ? (
    <p id={id} className="text-stop text-sm">
      {message}
    </p>
  ) : null;
}

/** What came of a form: a refusal (alert) or a success (status). */
export function Outcome({ kind, children }: { kind: 'error' | 'done' | null; children: ReactNode }) {
  if (!kind) return null;
  return kind === 'error' ? (
    <p role="alert" className="text-stop font-bold">
      {children}
    </p>
  ) : (
    <p role="status" className="text-ink">
      {children}
    </p>
  );
}
