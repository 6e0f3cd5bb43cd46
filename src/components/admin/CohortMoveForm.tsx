import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import type { AccountSummary, CohortMoveAnswer, CohortSummary } from '../../lib/contract';
import { cohortMoveSchema } from '../../lib/contract-accounts';
import { useWrite } from './api';
import { idOrNull, showRefusal } from './forms';
import { BUTTON, CONTROL, FieldError, Outcome } from './ui';

const schema = cohortMoveSchema.omit({ id: true });
type Values = z.infer<typeof schema>;

/**
 * Moves a student into a cohort. Archived cohorts are not offered (the student's own stays
 * listed, marked, so the form shows where they are).
 */
export function CohortMoveForm({
  student,
  cohorts,
  onDone,
}: {
  student: AccountSummary;
  cohorts: CohortSummary[];
  onDone: () => void;
}) {
  const send = useWrite<CohortMoveAnswer>('POST');
  const [outcome, setOutcome] = useState<{ kind: 'error' | 'done'; text: string } | null>(null);
  const current = student.cohort?.cohortId ?? null;
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<Values>({ resolver: zodResolver(schema), defaultValues: { cohortId: current } });
  const fieldId = `cohort-of-${student.userId}`;
  const offered = cohorts.filter((c) => !c.archived || c.cohortId === current);

  const submit = handleSubmit(async (values) => {
    setOutcome(null);
    const reply = await send(`/api/users/${student.userId}/cohort`, values);
    if (reply.ok && reply.body) {
      const to = cohorts.find((c) => c.cohortId === values.cohortId)?.name;
      setOutcome({
        kind: 'done',
        text: reply.body.moved
          ? `${student.name} is now in ${to ?? 'no cohort'}.`
          : `${student.name} was already there.`,
      });
      onDone();
      return;
    }
    const text = showRefusal(reply, setError, ['cohortId']);
    if (text) setOutcome({ kind: 'error', text });
  });

  return (
    <form onSubmit={(e) => void submit(e)} noValidate className="flex flex-col gap-2">
      <label htmlFor={fieldId} className="font-bold">
        Cohort of {student.name}
      </label>
      <div className="flex flex-wrap gap-3">
        <select
          id={fieldId}
          className={`${CONTROL} min-w-0 flex-1`}
          aria-invalid={errors.cohortId ? true : undefined}
          aria-describedby={errors.cohortId ? `${fieldId}-error` : undefined}
          {...register('cohortId', { setValueAs: idOrNull })}
        >
          <option value="">No cohort</option>
          {offered.map((c) => (
            <option key={c.cohortId} value={c.cohortId}>
              {c.name}
              {c.archived ? ' (archived)' : ''}
            </option>
          ))}
        </select>
        <button type="submit" className={BUTTON} disabled={isSubmitting}>
          Move
        </button>
      </div>
      <FieldError id={`${fieldId}-error`} message={errors.cohortId?.message} />
      <Outcome kind={outcome?.kind ?? null}>{outcome?.text}</Outcome>
    </form>
  );
}
