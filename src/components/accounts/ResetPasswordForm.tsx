/** The reset page's form: a new password, typed twice; then on to the sign-in page. */
import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { MIN_PASSWORD_CHARS, resetConfirmFormSchema } from '../../lib/account-forms';
import { BUTTON_CLASS, Field, FormMessage, useHydrated } from './Field';
import { newRequestId, postJson } from './ids';

type Values = { password: string; confirm: string };

export default function ResetPasswordForm({ token }: { token: string }) {
  const hydrated = useHydrated();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<Values>({ resolver: zodResolver(resetConfirmFormSchema), defaultValues: { password: '', confirm: '' } });

  const onSubmit = handleSubmit(async ({ password }) => {
    const answer = await postJson(`/api/password-resets/${encodeURIComponent(token)}`, {
      id: newRequestId(),
      password,
    });
    const error = typeof answer.body.error === 'string' ? answer.body.error : undefined;
    if (answer.status === 200 && typeof answer.body.signIn === 'string') {
      window.location.assign(answer.body.signIn);
      return;
    }
    if (answer.body.field === 'password') setError('password', { message: error });
    else setError('root', { message: error ?? 'The password could not be set. Try again.' });
  });

  return (
    <form method="post" onSubmit={onSubmit} noValidate className="flex flex-col gap-3">
      <Field
        label="New password"
        type="password"
        autoComplete="new-password"
        maxLength={200}
        hint={`At least ${MIN_PASSWORD_CHARS} characters, not a commonly used password.`}
        registration={register('password')}
        error={errors.password?.message}
      />
      <Field
        label="New password again"
        type="password"
        autoComplete="new-password"
        maxLength={200}
        registration={register('confirm')}
        error={errors.confirm?.message}
      />
      <FormMessage tone="error" message={errors.root?.message} />
      <button type="submit" className={BUTTON_CLASS} disabled={!hydrated || isSubmitting}>
        {isSubmitting ? 'Setting your password…' : 'Set my new password'}
      </button>
    </form>
  );
}
