/** The forgotten-password form: an e-mail address; the answer is the same for every address. */
import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { resetRequestFormSchema } from '../../lib/account-forms';
import { BUTTON_CLASS, Field, FormMessage, useHydrated } from './Field';
import { newRequestId, postJson } from './ids';

type Values = { email: string };

export default function ForgotPasswordForm() {
  const [sent, setSent] = useState<string | null>(null);
  const hydrated = useHydrated();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<Values>({ resolver: zodResolver(resetRequestFormSchema), defaultValues: { email: '' } });

  const onSubmit = handleSubmit(async ({ email }) => {
    setSent(null);
    const answer = await postJson('/api/password-resets', { id: newRequestId(), email });
    const error = typeof answer.body.error === 'string' ? answer.body.error : undefined;
    if (answer.status === 202) setSent(typeof answer.body.message === 'string' ? answer.body.message : 'Sent.');
    else if (answer.body.field === 'email') setError('email', { message: error });
    else setError('root', { message: error ?? 'The request could not be sent. Try again.' });
  });

  return (
    <form method="post" onSubmit={onSubmit} noValidate className="flex flex-col gap-3">
      <Field
        label="E-mail"
        type="email"
        autoComplete="username"
        maxLength={254}
        registration={register('email')}
        error={errors.email?.message}
      />
      <FormMessage tone="error" message={errors.root?.message} />
      <FormMessage tone="done" message={sent ?? undefined} />
      <button type="submit" className={BUTTON_CLASS} disabled={!hydrated || isSubmitting}>
        {isSubmitting ? 'Sending…' : 'Send me a link'}
      </button>
    </form>
  );
}
