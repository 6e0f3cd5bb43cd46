/**
 * The director's accounts screen (/admin/accounts): every account with its cohort, assignments,
 * state and sign-in hold; "Manage" opens one account to deactivate or re-activate it, lift its
 * hold, change its role, move it between cohorts and set its attendings.
 */
import { QueryClientProvider } from '@tanstack/react-query';
import { useMemo, useState } from 'react';
import { ROLES, type AccountSummary, type Clinic, type CohortSummary, type Role } from '../../lib/contract';
import { formatInstant } from '../../lib/present/format';
import { roleLabel } from '../../lib/present/labels';
import { makeQueryClient, useAccounts, useCohorts } from './data';
import { ManageAccount } from './ManageAccount';
import { BUTTON_QUIET, CONTROL } from './ui';

interface Props {
  accounts: AccountSummary[];
  cohorts: CohortSummary[];
  /** The signed-in director. */
  meId: number;
  clinic: Clinic;
}

export default function AccountsApp(props: Props) {
  const [client] = useState(makeQueryClient);
  return (
    <QueryClientProvider client={client}>
      <Accounts {...props} />
    </QueryClientProvider>
  );
}

/** Who an account is assigned to, in a few words. */
function assignedLine(a: AccountSummary): string {
  const names = (people: { name: string; active: boolean }[]) =>
    people.map((p) => (p.active ? p.name : `${p.name} (deactivated)`)).join(', ');
  if (a.role === 'student') return a.attendings.length ? names(a.attendings) : 'No attending';
  if (a.role === 'attending') return a.students.length ? names(a.students) : 'No students';
  return '—';
}

function Accounts({ accounts: initialAccounts, cohorts: initialCohorts, meId, clinic }: Props) {
  const accounts = useAccounts(initialAccounts);
  const cohorts = useCohorts(initialCohorts);
  const [text, setText] = useState('');
  const [role, setRole] = useState<Role | ''>('');
  const [managing, setManaging] = useState<number | null>(null);
  const shown = useMemo(() => {
    const t = text.trim().toLowerCase();
    return accounts.filter(
      (a) =>
        (role === '' || a.role === role) &&
        (t === '' || a.name.toLowerCase().includes(t) || a.email.toLowerCase().includes(t)),
    );
  }, [accounts, text, role]);
  const current = accounts.find((a) => a.userId === managing) ?? null;
  const heldUntil = (iso: string) => formatInstant(iso, clinic, 'time');

  return (
    <div>
      <div className="flex flex-wrap gap-4 items-end mb-4">
        <div className="flex flex-col gap-1">
          <label htmlFor="accounts-find" className="font-bold">
            Find by name or e-mail
          </label>
          <input
            id="accounts-find"
            type="search"
            className={CONTROL}
            value={text}
            onChange={(e) => setText(e.target.value)}
          />
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="accounts-role" className="font-bold">
            Role
          </label>
          <select
            id="accounts-role"
            className={CONTROL}
            value={role}
            onChange={(e) => setRole(e.target.value as Role | '')}
          >
            <option value="">Every role</option>
            {ROLES.map((r) => (
              <option key={r} value={r}>
                {roleLabel(r)}
              </option>
            ))}
          </select>
        </div>
        <p className="text-muted pb-3" aria-live="polite">
          {shown.length} of {accounts.length} accounts
        </p>
      </div>
      <div className="relative overflow-x-auto bg-white border border-line rounded-lg">
        <table className="w-full text-left border-collapse">
          <caption className="sr-only">Accounts</caption>
          <thead className="bg-paper">
            <tr>
              <th scope="col" className="p-3">
                Name
              </th>
              <th scope="col" className="p-3 hidden md:table-cell">
                Role
              </th>
              <th scope="col" className="p-3 hidden md:table-cell">
                Cohort
              </th>
              <th scope="col" className="p-3 hidden lg:table-cell">
                Assigned
              </th>
              <th scope="col" className="p-3">
                State
              </th>
              <th scope="col" className="p-3">
                <span className="sr-only">Manage</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {shown.map((a) => (
              <tr key={a.userId} className="border-t border-line align-top" data-testid={`account-${a.userId}`}>
                <td className="p-3">
                  <span className="font-bold">{a.name}</span>
                  {a.userId === meId && <span className="text-muted"> (you)</span>}
                  <span className="block text-sm text-muted break-all">{a.email}</span>
                  <span className="block text-sm md:hidden">
                    {roleLabel(a.role)}
                    {a.cohort ? ` · ${a.cohort.name}` : ''}
                  </span>
                  <span className="block text-sm lg:hidden">{a.role === 'director' ? '' : assignedLine(a)}</span>
                </td>
                <td className="p-3 hidden md:table-cell">{roleLabel(a.role)}</td>
                <td className="p-3 hidden md:table-cell">
                  {a.cohort ? `${a.cohort.name}${a.cohort.archived ? ' (archived)' : ''}` : '—'}
                </td>
                <td className="p-3 hidden lg:table-cell">{assignedLine(a)}</td>
                <td className="p-3">
                  {a.active ? 'Active' : <strong>Deactivated</strong>}
                  {a.heldUntil && (
                    <span className="block text-sm text-caution font-bold">
                      ▲ Sign-in held until {heldUntil(a.heldUntil)}
                    </span>
                  )}
                </td>
                <td className="p-3">
                  <button
                    type="button"
                    className={BUTTON_QUIET}
                    onClick={() => setManaging(a.userId)}
                    aria-label={`Manage ${a.name}`}
                  >
                    Manage
                  </button>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        {shown.length === 0 && <p className="p-3 text-muted">No account matches.</p>}
      </div>
      {current && (
        <ManageAccount
          key={current.userId}
          account={current}
          accounts={accounts}
          cohorts={cohorts}
          meId={meId}
          heldUntil={heldUntil}
          onClose={() => setManaging(null)}
        />
      )}
    </div>
  );
}
