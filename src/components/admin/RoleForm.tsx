import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { ROLES, type AccountSummary, type RoleAnswer } from '../../lib/contract';
import { roleChangeSchema } from '../../lib/contract-accounts';
import { roleLabel } from '../../lib/present/labels';
import { useWrite } from './api';
import { showRefusal } from './forms';
import { BUTTON, CONTROL, FieldError, Outcome } from './ui';

const schema = roleChangeSchema.omit({ id: true });
type Values = z.infer<typeof schema>;

/** Changes an account's role; says what went with the old one. */
export function RoleForm({ account, onDone }: { account: AccountSummary; onDone: (a: RoleAnswer) => void }) {
  const send = useWrite<RoleAnswer>('POST');
  const [outcome, setOutcome] = useState<{ kind: 'error' | 'done'; text: string } | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<Values>({ resolver: zodResolver(schema), defaultValues: { role: account.role } });
  const fieldId = `role-${account.userId}`;

  const submit = handleSubmit(async (values) => {
    setOutcome(null);
    const reply = await send(`/api/users/${account.userId}/role`, values);
    if (reply.ok && reply.body) {
      const a = reply.body;
      const removed = a.assignmentsRemoved.length;
      setOutcome({
        kind: 'done',
        text: `${account.name} is now ${roleLabel(values.role).toLowerCase()}. ${a.sessionsEnded} session${a.sessionsEnded === 1 ? '' : 's'} ended; ${removed} assignment${removed === 1 ? '' : 's'} removed.`,
      });
      onDone(a);
      return;
    }
    const text = showRefusal(reply, setError, ['role']);
    if (text) setOutcome({ kind: 'error', text });
  });

  return (
    <form onSubmit={(e) => void submit(e)} noValidate className="flex flex-col gap-2">
      <label htmlFor={fieldId} className="font-bold">
        Role
      </label>
      <div className="flex flex-wrap gap-3">
        <select
          id={fieldId}
          className={CONTROL}
          aria-invalid={errors.role ? true : undefined}
          aria-describedby={errors.role ? `${fieldId}-error` : undefined}
          {...register('role')}
        >
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {roleLabel(r)}
            </option>
          ))}
        </select>
        <button type="submit" className={BUTTON} disabled={isSubmitting}>
          Change role
        </button>
      </div>
      <FieldError id={`${fieldId}-error`} message={errors.role?.message} />
      <Outcome kind={outcome?.kind ?? null}>{outcome?.text}</Outcome>
    </form>
  );
}
