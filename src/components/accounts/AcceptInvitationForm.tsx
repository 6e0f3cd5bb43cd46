/** The invitation page's form: choose a name and a password; then on to the sign-in page. */
import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { acceptFormSchema, MIN_PASSWORD_CHARS } from '../../lib/account-forms';
import { BUTTON_CLASS, Field, FormMessage, useHydrated } from './Field';
import { newRequestId, postJson } from './ids';

interface Props {
  token: string;
  email: string;
  suggestedName: string;
}

type Values = { name: string; password: string; confirm: string };

export default function AcceptInvitationForm({ token, email, suggestedName }: Props) {
  const hydrated = useHydrated();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<Values>({
    resolver: zodResolver(acceptFormSchema),
    defaultValues: { name: suggestedName, password: '', confirm: '' },
  });

  const onSubmit = handleSubmit(async ({ name, password }) => {
    const answer = await postJson(`/api/invitations/${encodeURIComponent(token)}/accept`, {
      id: newRequestId(),
      name,
      password,
    });
    const error = typeof answer.body.error === 'string' ? answer.body.error : undefined;
    if (answer.status === 201 && typeof answer.body.signIn === 'string') {
      window.location.assign(answer.body.signIn);
      return;
    }
    const field = answer.body.field;
    if (field === 'name' || field === 'password') setError(field, { message: error });
    else setError('root', { message: error ?? 'Your account could not be made. Try again.' });
  });

  return (
    <form method="post" onSubmit={onSubmit} noValidate className="flex flex-col gap-3">
      {/* The e-mail the account will use, for password managers; it cannot be changed here. */}
      <input type="email" name="username" autoComplete="username" value={email} readOnly hidden />
      <Field
        label="Your name"
        defaultValue={suggestedName}
        autoComplete="name"
        maxLength={120}
        hint="The name others in the clinic see beside your work."
        registration={register('name')}
        error={errors.name?.message}
      />
      <Field
        label="Password"
        type="password"
        autoComplete="new-password"
        maxLength={200}
        hint={`At least ${MIN_PASSWORD_CHARS} characters, not a commonly used password.`}
        registration={register('password')}
        error={errors.password?.message}
      />
      <Field
        label="Password again"
        type="password"
        autoComplete="new-password"
        maxLength={200}
        registration={register('confirm')}
        error={errors.confirm?.message}
      />
      <FormMessage tone="error" message={errors.root?.message} />
      <button type="submit" className={BUTTON_CLASS} disabled={!hydrated || isSubmitting}>
        {isSubmitting ? 'Making your account…' : 'Make my account'}
      </button>
    </form>
  );
}
