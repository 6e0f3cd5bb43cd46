import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import type { CohortAnswer, CohortSummary } from '../../lib/contract';
import { cohortCreateSchema } from '../../lib/contract-accounts';
import { useWrite } from './api';
import { showRefusal } from './forms';
import { BUTTON, BUTTON_QUIET, CONTROL, FieldError, Outcome } from './ui';

// The same fields whether a cohort is made or renamed; only the request differs.
const schema = cohortCreateSchema.omit({ id: true });
type Values = z.infer<typeof schema>;

const yearOrNull = (v: unknown): number | null => (v === '' || v === null || v === undefined ? null : Number(v));

/** Creates a cohort, or (given `cohort`) renames it and sets its class year. */
export function CohortForm({
  cohort,
  onDone,
  onCancel,
}: {
  cohort?: CohortSummary;
  onDone: (c: CohortSummary) => void;
  onCancel?: () => void;
}) {
  const send = useWrite<CohortAnswer>(cohort ? 'PATCH' : 'POST');
  const [said, setSaid] = useState<{ kind: 'error' | 'done'; text: string } | null>(null);
  const {
    register,
    handleSubmit,
    reset,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<Values>({
    resolver: zodResolver(schema),
    defaultValues: { name: cohort?.name ?? '', graduationYear: cohort?.graduationYear ?? null },
  });
  const prefix = cohort ? `cohort-${cohort.cohortId}` : 'new-cohort';

  const submit = handleSubmit(async (values) => {
    setSaid(null);
    const reply = await send(cohort ? `/api/cohorts/${cohort.cohortId}` : '/api/cohorts', {
      name: values.name,
      graduationYear: values.graduationYear ?? null,
    });
    if (reply.ok && reply.body) {
      const made = reply.body.cohort;
      if (!cohort) reset({ name: '', graduationYear: null });
      setSaid({ kind: 'done', text: cohort ? `Saved: “${made.name}”.` : `Created “${made.name}”.` });
      onDone(made);
      return;
    }
    const text = showRefusal(reply, setError, ['name', 'graduationYear']);
    if (text) setSaid({ kind: 'error', text });
  });

  return (
    <form onSubmit={(e) => void submit(e)} noValidate className="flex flex-col gap-3">
      <div className="flex flex-wrap gap-4 items-start">
        <div className="flex flex-col gap-1 min-w-0 flex-[2_1_14rem]">
          <label htmlFor={`${prefix}-name`} className="font-bold">
            {cohort ? `New name for ${cohort.name}` : 'Name'}
          </label>
          <input
            id={`${prefix}-name`}
            className={CONTROL}
            autoComplete="off"
            aria-invalid={errors.name ? true : undefined}
            aria-describedby={errors.name ? `${prefix}-name-error` : undefined}
            {...register('name')}
          />
          <FieldError id={`${prefix}-name-error`} message={errors.name?.message} />
        </div>
        <div className="flex flex-col gap-1 flex-[1_1_8rem]">
          <label htmlFor={`${prefix}-year`} className="font-bold">
            Class year <span className="font-normal text-muted">(optional)</span>
          </label>
          <input
            id={`${prefix}-year`}
            inputMode="numeric"
            className={CONTROL}
            aria-invalid={errors.graduationYear ? true : undefined}
            aria-describedby={errors.graduationYear ? `${prefix}-year-error` : undefined}
            {...register('graduationYear', { setValueAs: yearOrNull })}
          />
          <FieldError id={`${prefix}-year-error`} message={errors.graduationYear?.message} />
        </div>
      </div>
      <div className="flex flex-wrap gap-3">
        <button type="submit" className={BUTTON} disabled={isSubmitting}>
          {cohort ? 'Save' : 'Create cohort'}
        </button>
        {onCancel && (
          <button type="button" className={BUTTON_QUIET} onClick={onCancel}>
            Cancel
          </button>
        )}
      </div>
      <Outcome kind={said?.kind ?? null}>{said?.text}</Outcome>
    </form>
  );
}
