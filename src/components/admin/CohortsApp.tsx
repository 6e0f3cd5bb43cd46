/**
 * The director's cohorts screen (/admin/cohorts): create, rename and archive cohorts, move
 * students between them, and set each student's attendings.
 */
import { QueryClientProvider } from '@tanstack/react-query';
import { useState } from 'react';
import type { AccountSummary, CohortAnswer, CohortSummary } from '../../lib/contract';
import { useWrite } from './api';
import { AttendingsForm } from './AttendingsForm';
import { CohortForm } from './CohortForm';
import { CohortMoveForm } from './CohortMoveForm';
import { attendingsIn, makeQueryClient, useAccounts, useCohorts, useRefresh } from './data';
import { BUTTON_QUIET, CONTROL, Outcome } from './ui';

interface Props {
  accounts: AccountSummary[];
  cohorts: CohortSummary[];
}

export default function CohortsApp(props: Props) {
  const [client] = useState(makeQueryClient);
  return (
    <QueryClientProvider client={client}>
      <Cohorts {...props} />
    </QueryClientProvider>
  );
}

function Cohorts({ accounts: initialAccounts, cohorts: initialCohorts }: Props) {
  const accounts = useAccounts(initialAccounts);
  const cohorts = useCohorts(initialCohorts);
  const refresh = useRefresh();
  const inUse = cohorts.filter((c) => !c.archived);
  const archived = cohorts.filter((c) => c.archived);

  return (
    <div className="flex flex-col gap-8">
      <section aria-labelledby="new-cohort-h" className="bg-white border border-line rounded-lg p-4">
        <h2 id="new-cohort-h" className="text-xl font-bold mb-3">
          New cohort
        </h2>
        <CohortForm onDone={refresh} />
      </section>

      <section aria-labelledby="cohorts-h">
        <h2 id="cohorts-h" className="text-xl font-bold mb-3">
          Cohorts in use
        </h2>
        <CohortList cohorts={inUse} empty="No cohort in use yet." onChanged={refresh} />
      </section>

      {archived.length > 0 && (
        <section aria-labelledby="archived-h">
          <h2 id="archived-h" className="text-xl font-bold mb-1">
            Archived cohorts
          </h2>
          <p className="text-muted mb-3">
            Hidden from the cohort pickers; their students and cases stay in every record and in the case list.
          </p>
          <CohortList cohorts={archived} empty="" onChanged={refresh} />
        </section>
      )}

      <Students accounts={accounts} cohorts={cohorts} onChanged={refresh} />
    </div>
  );
}

function CohortList({ cohorts, empty, onChanged }: { cohorts: CohortSummary[]; empty: string; onChanged: () => void }) {
  if (cohorts.length === 0) return <p className="text-muted">{empty}</p>;
  return (
    <ul className="flex flex-col gap-3">
      {cohorts.map((c) => (
        <CohortItem key={c.cohortId} cohort={c} onChanged={onChanged} />
      ))}
    </ul>
  );
}

function CohortItem({ cohort, onChanged }: { cohort: CohortSummary; onChanged: () => void }) {
  const [renaming, setRenaming] = useState(false);
  const send = useWrite<CohortAnswer>('PATCH');
  const [busy, setBusy] = useState(false);
  const [said, setSaid] = useState<{ kind: 'error' | 'done'; text: string } | null>(null);
  const archive = async (archived: boolean) => {
    setBusy(true);
    setSaid(null);
    const reply = await send(`/api/cohorts/${cohort.cohortId}`, { archived });
    setBusy(false);
    if (reply.ok) onChanged();
    else setSaid({ kind: 'error', text: reply.error?.error ?? 'Nothing was changed.' });
  };
  return (
    <li className="bg-white border border-line rounded-lg p-4 flex flex-col gap-3" data-testid="cohort">
      <div className="flex flex-wrap items-center gap-x-6 gap-y-2">
        <p className="flex-1 min-w-48">
          <strong className="text-lg">{cohort.name}</strong>
          <span className="block text-muted">
            {cohort.graduationYear ? `Class of ${cohort.graduationYear} · ` : ''}
            {cohort.members} student{cohort.members === 1 ? '' : 's'}
          </span>
        </p>
        {!renaming && (
          <div className="flex flex-wrap gap-3">
            <button
              type="button"
              className={BUTTON_QUIET}
              onClick={() => setRenaming(true)}
              aria-label={`Rename ${cohort.name}`}
            >
              Rename
            </button>
            <button
              type="button"
              className={BUTTON_QUIET}
              disabled={busy}
              onClick={() => void archive(!cohort.archived)}
              aria-label={cohort.archived ? `Bring back ${cohort.name}` : `Archive ${cohort.name}`}
            >
              {cohort.archived ? 'Bring back' : 'Archive'}
            </button>
          </div>
        )}
      </div>
      {renaming && (
        <CohortForm
          cohort={cohort}
          onDone={() => {
            setRenaming(false);
            onChanged();
          }}
          onCancel={() => setRenaming(false)}
        />
      )}
      <Outcome kind={said?.kind ?? null}>{said?.text}</Outcome>
    </li>
  );
}

const NO_COHORT = 'none';

function Students({
  accounts,
  cohorts,
  onChanged,
}: {
  accounts: AccountSummary[];
  cohorts: CohortSummary[];
  onChanged: () => void;
}) {
  const [only, setOnly] = useState('');
  const attendings = attendingsIn(accounts);
  const students = accounts.filter(
    (a) =>
      a.role === 'student' &&
      (only === '' || (only === NO_COHORT ? a.cohort === null : String(a.cohort?.cohortId) === only)),
  );
  return (
    <section aria-labelledby="students-h">
      <h2 id="students-h" className="text-xl font-bold mb-1">
        Students
      </h2>
      <p className="text-muted mb-3">
        Move a student to another cohort, and choose the attendings who review their cases (one or more).
      </p>
      <div className="flex flex-col gap-1 mb-4 max-w-sm">
        <label htmlFor="students-of" className="font-bold">
          Show the students of
        </label>
        <select id="students-of" className={CONTROL} value={only} onChange={(e) => setOnly(e.target.value)}>
          <option value="">Every cohort</option>
          <option value={NO_COHORT}>No cohort</option>
          {cohorts.map((c) => (
            <option key={c.cohortId} value={String(c.cohortId)}>
              {c.name}
              {c.archived ? ' (archived)' : ''}
            </option>
          ))}
        </select>
      </div>
      {students.length === 0 && <p className="text-muted">No student here.</p>}
      <ul className="flex flex-col gap-3">
        {students.map((s) => (
          <li
            key={s.userId}
            className="bg-white border border-line rounded-lg p-4 grid gap-4 md:grid-cols-[12rem_1fr_1.4fr]"
            data-testid={`student-${s.userId}`}
          >
            <p>
              <strong>{s.name}</strong>
              <span className="block text-sm text-muted break-all">{s.email}</span>
              {!s.active && <span className="block text-sm font-bold">Deactivated</span>}
            </p>
            <CohortMoveForm student={s} cohorts={cohorts} onDone={onChanged} />
            <AttendingsForm student={s} attendings={attendings} onDone={onChanged} />
          </li>
        ))}
      </ul>
    </section>
  );
}
