import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import type { z } from 'zod';
import type { AccountSummary, AssignmentsAnswer, PersonRef } from '../../lib/contract';
import { assignmentsSchema } from '../../lib/contract-accounts';
import { useWrite } from './api';
import { showRefusal } from './forms';
import { BUTTON, FieldError, Outcome } from './ui';

const schema = assignmentsSchema.omit({ id: true });
type Values = z.infer<typeof schema>;

/**
 * Sets a student's attendings: every active attending to tick, and any deactivated one still
 * assigned (to untick). The whole set is sent; the server answers what was added and removed.
 */
export function AttendingsForm({
  student,
  attendings,
  onDone,
}: {
  student: Pick<AccountSummary, 'userId' | 'name' | 'attendings'>;
  /** Every attending account. */
  attendings: PersonRef[];
  onDone: () => void;
}) {
  const send = useWrite<AssignmentsAnswer>('PUT');
  const [outcome, setOutcome] = useState<{ kind: 'error' | 'done'; text: string } | null>(null);
  const assigned = student.attendings.map((a) => a.userId);
  const {
    control,
    handleSubmit,
    reset,
    setError,
    formState: { errors, isSubmitting, isDirty },
  } = useForm<Values>({ resolver: zodResolver(schema), defaultValues: { attendingIds: assigned } });
  const offered = attendings.filter((a) => a.active || assigned.includes(a.userId));
  const groupId = `attendings-of-${student.userId}`;

  const submit = handleSubmit(async (values) => {
    setOutcome(null);
    const reply = await send(`/api/users/${student.userId}/assignments`, values);
    if (reply.ok && reply.body) {
      reset(values);
      const names = reply.body.attendings.map((a) => (a.active ? a.name : `${a.name} (deactivated)`));
      setOutcome({
        kind: 'done',
        text: names.length
          ? `Saved: ${student.name} is reviewed by ${names.join(', ')}.`
          : `Saved: ${student.name} has no attending now.`,
      });
      onDone();
      return;
    }
    const text = showRefusal(reply, setError, ['attendingIds']);
    if (text) setOutcome({ kind: 'error', text });
  });

  return (
    <form onSubmit={(e) => void submit(e)} noValidate className="flex flex-col gap-2">
      <fieldset aria-describedby={errors.attendingIds ? `${groupId}-error` : undefined} className="flex flex-col gap-1">
        <legend className="font-bold mb-1">Attendings of {student.name}</legend>
        {offered.length === 0 && <p className="text-muted">There is no active attending yet.</p>}
        <Controller
          control={control}
          name="attendingIds"
          render={({ field }) => (
            <div className="flex flex-wrap gap-x-4">
              {offered.map((a) => {
                const checked = field.value.includes(a.userId);
                return (
                  <label key={a.userId} className="inline-flex items-center gap-2 min-h-12 pr-2">
                    <input
                      type="checkbox"
                      className="size-6 accent-gutta-strong"
                      checked={checked}
                      onChange={() =>
                        field.onChange(
                          checked ? field.value.filter((id) => id !== a.userId) : [...field.value, a.userId],
                        )
                      }
                    />
                    {a.name}
                    {a.active ? '' : ' (deactivated)'}
                  </label>
                );
              })}
            </div>
          )}
        />
      </fieldset>
      <FieldError id={`${groupId}-error`} message={errors.attendingIds?.message} />
      <div>
        <button type="submit" className={BUTTON} disabled={isSubmitting || !isDirty}>
          Save attendings
        </button>
      </div>
      <Outcome kind={outcome?.kind ?? null}>{outcome?.text}</Outcome>
    </form>
  );
}
