/**
 * Invite a cohort of students from a CSV file of `name,email` rows (or pasted rows). The server
 * reads the CSV (papaparse) and invites each row through the same service as one invitation;
 * each row's result is shown here.
 */
import { zodResolver } from '@hookform/resolvers/zod';
import { useState, type ChangeEvent } from 'react';
import { Controller, useForm } from 'react-hook-form';
import {
  inviteCsvFormSchema,
  MAX_CSV_CHARS,
  type CsvAnswer,
  type CsvRowStatus,
  type InviteCsvForm as Values,
} from '../../lib/account-forms';
import { BUTTON_CLASS, FieldError, FormMessage, INPUT_CLASS, useHydrated } from '../accounts/Field';
import { newRequestId, postJson } from '../accounts/ids';
import { AttendingPicker, CohortSelect, type Named } from './InvitationChoices';

const STATUS_WORDS: Record<CsvRowStatus, string> = {
  invited: 'Invited',
  'has-account': 'Already has an account',
  'already-invited': 'Already invited',
  duplicate: 'Duplicate in the file',
  'bad-email': 'Bad e-mail address',
  refused: 'Not invited',
};

export function InviteCsvForm(props: { cohorts: Named[]; attendings: Named[]; onDone: () => void }) {
  const [answer, setAnswer] = useState<CsvAnswer | null>(null);
  const hydrated = useHydrated();
  const {
    register,
    control,
    handleSubmit,
    setError,
    setValue,
    formState: { errors, isSubmitting },
  } = useForm<Values>({
    resolver: zodResolver(inviteCsvFormSchema),
    defaultValues: { csv: '', role: 'student', cohortId: null, attendingIds: [] },
  });

  const readFile = async (e: ChangeEvent<HTMLInputElement>) => {
    const file = e.target.files?.[0];
    if (!file) return;
    if (file.size > MAX_CSV_CHARS * 4) {
      setError('csv', { message: 'That file is too large for one invitation batch.' });
      return;
    }
    setValue('csv', await file.text(), { shouldValidate: true });
  };

  const onSubmit = handleSubmit(async (values) => {
    setAnswer(null);
    const res = await postJson('/api/invitations/csv', { id: newRequestId(), ...values });
    const error = typeof res.body.error === 'string' ? res.body.error : undefined;
    if (res.status === 200) {
      setAnswer(res.body as unknown as CsvAnswer);
      props.onDone();
      return;
    }
    const field = res.body.field;
    if (field === 'csv' || field === 'cohortId' || field === 'attendingIds') setError(field, { message: error });
    else setError('root', { message: error ?? 'The CSV could not be sent. Try again.' });
  });

  return (
    <form method="post" onSubmit={onSubmit} noValidate className="flex flex-col gap-3">
      <p>
        One student per row: <code>name,email</code>. A first row <code>name,email</code> is read as a header. Every row
        is invited as a <strong>student</strong>.
      </p>
      <div className="flex flex-col gap-1">
        <label htmlFor="csv-file" className="font-bold">
          CSV file
        </label>
        <input id="csv-file" type="file" accept=".csv,text/csv,text/plain" onChange={readFile} className="min-h-11" />
      </div>
      <div className="flex flex-col gap-1">
        <label htmlFor="csv-text" className="font-bold">
          Rows (from the file, or pasted)
        </label>
        <textarea
          id="csv-text"
          rows={6}
          className={`${INPUT_CLASS} font-mono text-base`}
          aria-invalid={errors.csv ? true : undefined}
          aria-describedby="csv-text-error"
          {...register('csv')}
        />
        <FieldError id="csv-text-error" message={errors.csv?.message} />
      </div>
      <Controller
        control={control}
        name="cohortId"
        render={({ field }) => (
          <CohortSelect
            id="csv-cohort"
            cohorts={props.cohorts}
            value={field.value}
            onChange={field.onChange}
            error={errors.cohortId?.message}
          />
        )}
      />
      <Controller
        control={control}
        name="attendingIds"
        render={({ field }) => (
          <AttendingPicker
            id="csv-attendings"
            attendings={props.attendings}
            value={field.value}
            onChange={field.onChange}
            error={errors.attendingIds?.message}
          />
        )}
      />
      <FormMessage tone="error" message={errors.root?.message} />
      <button type="submit" className={BUTTON_CLASS} disabled={!hydrated || isSubmitting}>
        {isSubmitting ? 'Inviting…' : 'Invite every row'}
      </button>
      {answer && <CsvResults answer={answer} />}
    </form>
  );
}

function CsvResults({ answer }: { answer: CsvAnswer }) {
  return (
    <div className="mt-2">
      <h3 id="csv-results-h" className="text-lg font-bold">
        Result of each row
      </h3>
      <p role="status" className="mb-2">
        {answer.invited} of {answer.rows.length} row{answer.rows.length === 1 ? '' : 's'} invited
      </p>
      {/* Focusable, so a keyboard can scroll a table wider than the screen (axe: scrollable-region-focusable). */}
      <div
        className="overflow-x-auto"
        // eslint-disable-next-line jsx-a11y/no-noninteractive-tabindex -- a labelled scrollable region, as WAI-ARIA advises
        tabIndex={0}
        role="region"
        aria-labelledby="csv-results-h"
      >
        <table className="w-full text-left border-collapse" data-testid="csv-results">
          <thead className="bg-paper">
            <tr>
              <th scope="col" className="p-2">
                Line
              </th>
              <th scope="col" className="p-2">
                Name
              </th>
              <th scope="col" className="p-2">
                E-mail
              </th>
              <th scope="col" className="p-2">
                Result
              </th>
            </tr>
          </thead>
          <tbody>
            {answer.rows.map((r) => (
              <tr key={r.line} className="border-t border-line" data-status={r.status}>
                <td className="p-2">{r.line}</td>
                <td className="p-2">{r.name}</td>
                <td className="p-2">{r.email}</td>
                <td className="p-2">
                  <span className={r.status === 'invited' ? 'font-bold' : 'font-bold text-stop'}>
                    {STATUS_WORDS[r.status]}
                  </span>
                  {r.status !== 'invited' && <span className="block text-sm">{r.message}</span>}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
