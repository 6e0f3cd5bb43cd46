/** The cohort and attendings pickers the invitation forms share. */
import type { ChangeEvent } from 'react';
import { FieldError, INPUT_CLASS } from '../accounts/Field';

export interface Named {
  id: number;
  name: string;
}

/** A cohort select whose value is a cohort id or null ("no cohort"). */
export function CohortSelect(props: {
  id: string;
  cohorts: Named[];
  value: number | null | undefined;
  onChange: (v: number | null) => void;
  error?: string | undefined;
}) {
  const errorId = `${props.id}-error`;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={props.id} className="font-bold">
        Cohort
      </label>
      <select
        id={props.id}
        className={INPUT_CLASS}
        value={props.value ?? ''}
        aria-invalid={props.error ? true : undefined}
        aria-describedby={errorId}
        onChange={(e: ChangeEvent<HTMLSelectElement>) =>
          props.onChange(e.target.value === '' ? null : Number(e.target.value))
        }
      >
        <option value="">No cohort</option>
        {props.cohorts.map((c) => (
          <option key={c.id} value={c.id}>
            {c.name}
          </option>
        ))}
      </select>
      <FieldError id={errorId} message={props.error} />
    </div>
  );
}

/** Check boxes, one per active attending; the value is the chosen ids. */
export function AttendingPicker(props: {
  id: string;
  attendings: Named[];
  value: number[] | undefined;
  onChange: (v: number[]) => void;
  error?: string | undefined;
}) {
  const chosen = new Set(props.value ?? []);
  const errorId = `${props.id}-error`;
  return (
    <fieldset id={props.id} className="flex flex-col gap-1" aria-describedby={errorId}>
      <legend className="font-bold">Attendings</legend>
      <p className="text-sm text-muted">Assigned to the student when the invitation is accepted.</p>
      {props.attendings.length === 0 && <p>There is no active attending yet.</p>}
      {props.attendings.map((a) => (
        <label key={a.id} className="flex items-center gap-3 min-h-11">
          <input
            type="checkbox"
            className="size-6"
            checked={chosen.has(a.id)}
            onChange={(e) => {
              const next = new Set(chosen);
              if (e.target.checked) next.add(a.id);
              else next.delete(a.id);
              props.onChange([...next]);
            }}
          />
          {a.name}
        </label>
      ))}
      <FieldError id={errorId} message={props.error} />
    </fieldset>
  );
}
