/** Invite one address: e-mail, name, role, cohort and (for a student) attendings. */
import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { Controller, useForm, useWatch } from 'react-hook-form';
import { inviteFormSchema, type InviteForm as Values, type InvitationView } from '../../lib/account-forms';
import { BUTTON_CLASS, Field, FieldError, FormMessage, INPUT_CLASS, useHydrated } from '../accounts/Field';
import { newRequestId, postJson } from '../accounts/ids';
import { AttendingPicker, CohortSelect, type Named } from './InvitationChoices';

const ROLE_WORDS = { student: 'Student', attending: 'Attending', director: 'Course director' } as const;

export function InviteForm(props: {
  cohorts: Named[];
  attendings: Named[];
  onInvited: (invitation: InvitationView) => void;
}) {
  const [done, setDone] = useState<string | null>(null);
  const hydrated = useHydrated();
  const {
    register,
    control,
    handleSubmit,
    setError,
    reset,
    formState: { errors, isSubmitting },
  } = useForm<Values>({
    resolver: zodResolver(inviteFormSchema),
    defaultValues: { email: '', name: '', role: 'student', cohortId: null, attendingIds: [] },
  });
  const role = useWatch({ control, name: 'role' });

  const onSubmit = handleSubmit(async (values) => {
    setDone(null);
    const body = { ...values, attendingIds: values.role === 'student' ? values.attendingIds : [] };
    const answer = await postJson('/api/invitations', { id: newRequestId(), ...body });
    const error = typeof answer.body.error === 'string' ? answer.body.error : undefined;
    if (answer.status === 201) {
      const invitation = answer.body.invitation as InvitationView;
      props.onInvited(invitation);
      setDone(`Invitation sent to ${invitation.email}.`);
      reset({ email: '', name: '', role: values.role, cohortId: values.cohortId, attendingIds: values.attendingIds });
      return;
    }
    const field = answer.body.field;
    if (field === 'email' || field === 'name' || field === 'role' || field === 'cohortId' || field === 'attendingIds')
      setError(field, { message: error });
    else setError('root', { message: error ?? 'The invitation could not be sent. Try again.' });
  });

  return (
    <form method="post" onSubmit={onSubmit} noValidate className="flex flex-col gap-3" aria-labelledby="invite-one-h">
      <Field
        id="invite-email"
        label="E-mail"
        type="email"
        autoComplete="off"
        maxLength={254}
        registration={register('email')}
        error={errors.email?.message}
      />
      <Field
        id="invite-name"
        label="Name (optional)"
        hint="Shown to them as a suggestion; they choose their own."
        autoComplete="off"
        maxLength={120}
        registration={register('name')}
        error={errors.name?.message}
      />
      <div className="flex flex-col gap-1">
        <label htmlFor="invite-role" className="font-bold">
          Role
        </label>
        <select
          id="invite-role"
          className={INPUT_CLASS}
          aria-describedby="invite-role-error"
          aria-invalid={errors.role ? true : undefined}
          {...register('role')}
        >
          {Object.entries(ROLE_WORDS).map(([value, words]) => (
            <option key={value} value={value}>
              {words}
            </option>
          ))}
        </select>
        <FieldError id="invite-role-error" message={errors.role?.message} />
      </div>
      <Controller
        control={control}
        name="cohortId"
        render={({ field }) => (
          <CohortSelect
            id="invite-cohort"
            cohorts={props.cohorts}
            value={field.value}
            onChange={field.onChange}
            error={errors.cohortId?.message}
          />
        )}
      />
      {role === 'student' && (
        <Controller
          control={control}
          name="attendingIds"
          render={({ field }) => (
            <AttendingPicker
              id="invite-attendings"
              attendings={props.attendings}
              value={field.value}
              onChange={field.onChange}
              error={errors.attendingIds?.message}
            />
          )}
        />
      )}
      <FormMessage tone="error" message={errors.root?.message} />
      <FormMessage tone="done" message={done ?? undefined} />
      <button type="submit" className={BUTTON_CLASS} disabled={!hydrated || isSubmitting}>
        {isSubmitting ? 'Sending…' : 'Send the invitation'}
      </button>
    </form>
  );
}
