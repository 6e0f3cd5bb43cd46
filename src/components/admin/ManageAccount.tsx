/** One account opened from the accounts screen, in a modal dialog: every change a director makes to it. */
import { useEffect, useRef, useState, type ReactNode } from 'react';
import type { AccountSummary, ActiveAnswer, CohortSummary, HoldsAnswer, StudentToReassign } from '../../lib/contract';
import { roleLabel } from '../../lib/present/labels';
import { useWrite } from './api';
import { AttendingsForm } from './AttendingsForm';
import { CohortMoveForm } from './CohortMoveForm';
import { attendingsIn, useRefresh } from './data';
import { RoleForm } from './RoleForm';
import { BUTTON, BUTTON_DANGER, BUTTON_QUIET, Outcome } from './ui';

interface Props {
  account: AccountSummary;
  accounts: AccountSummary[];
  cohorts: CohortSummary[];
  meId: number;
  heldUntil: (iso: string) => string;
  onClose: () => void;
}

type Said = { kind: 'error' | 'done'; text: string } | null;

const sessions = (n: number) => `${n} session${n === 1 ? '' : 's'}`;

export function ManageAccount({ account, accounts, cohorts, meId, heldUntil, onClose }: Props) {
  const dialog = useRef<HTMLDialogElement>(null);
  const refresh = useRefresh();
  // Students a change in this dialog took an attending from (a deactivation, a role change).
  const [lostAttending, setLostAttending] = useState<StudentToReassign[]>([]);
  const self = account.userId === meId;
  const attendings = attendingsIn(accounts);

  useEffect(() => {
    const d = dialog.current;
    if (d && !d.open) d.showModal();
  }, []);

  // A deactivated attending's students stay assigned to them (records stay) but need another.
  const ids = new Set([
    ...(account.role === 'attending' && !account.active ? account.students.filter((s) => s.active) : []).map(
      (s) => s.userId,
    ),
    ...lostAttending.map((s) => s.userId),
  ]);
  const toReassign = accounts.filter((a) => ids.has(a.userId) && a.role === 'student');
  const gone = account.userId;

  return (
    <dialog
      ref={dialog}
      onClose={onClose}
      aria-labelledby="manage-h"
      className="m-auto w-[min(44rem,calc(100vw-1rem))] max-h-[calc(100vh-1rem)] overflow-y-auto rounded-lg border border-line bg-paper p-0 text-ink backdrop:bg-[rgb(23_33_46/0.55)]"
    >
      <div className="sticky top-0 z-10 flex items-start gap-4 border-b border-line bg-white p-4">
        <div className="min-w-0 flex-1">
          <h2 id="manage-h" className="text-2xl font-bold">
            {account.name}
          </h2>
          <p className="text-muted break-all">
            {account.email} · {roleLabel(account.role)} · {account.active ? 'active' : 'deactivated'}
          </p>
        </div>
        <button type="button" className={BUTTON_QUIET} onClick={() => dialog.current?.close()}>
          Close
        </button>
      </div>
      <div className="flex flex-col gap-6 p-4">
        <Section title="Access">
          <ActiveControls
            account={account}
            self={self}
            onChanged={(a) => {
              setLostAttending(a.studentsToReassign);
              refresh();
            }}
          />
          <HoldControls account={account} heldUntil={heldUntil} onChanged={refresh} />
        </Section>

        {toReassign.length > 0 && (
          <Section title="Students to give another attending">
            <p>
              {account.name} no longer reviews these students. Each needs an active attending for their cases to be
              reviewed.
            </p>
            <ul className="flex flex-col gap-4">
              {toReassign.map((s) => {
                const others = s.attendings.filter((a) => a.active && a.userId !== gone);
                return (
                  <li key={s.userId} className="rounded border border-line bg-paper p-3" data-testid="reassign">
                    <p className="mb-2">
                      <strong>{s.name}</strong>:{' '}
                      {others.length ? (
                        `also reviewed by ${others.map((a) => a.name).join(', ')}.`
                      ) : (
                        <strong className="text-stop">■ no other active attending.</strong>
                      )}
                    </p>
                    <AttendingsForm student={s} attendings={attendings} onDone={refresh} />
                  </li>
                );
              })}
            </ul>
          </Section>
        )}

        <Section title="Role">
          {self ? (
            <p>You cannot change your own role; another director can.</p>
          ) : (
            <>
              <p className="text-sm text-muted">
                A new role ends the person’s sessions. A student leaves their cohort and attendings; an attending’s
                students lose them and are listed here for another. Cases, sign-offs and comments stay as they are.
              </p>
              <RoleForm
                account={account}
                onDone={(a) => {
                  setLostAttending(a.studentsToReassign);
                  refresh();
                }}
              />
            </>
          )}
        </Section>

        {account.role === 'student' && (
          <Section title="Cohort and attendings">
            <CohortMoveForm student={account} cohorts={cohorts} onDone={refresh} />
            <AttendingsForm student={account} attendings={attendings} onDone={refresh} />
          </Section>
        )}

        {account.role === 'attending' && account.active && (
          <Section title="Students">
            <p>
              {account.students.length
                ? `${account.students.map((s) => (s.active ? s.name : `${s.name} (deactivated)`)).join(', ')}.`
                : 'No students assigned.'}{' '}
              Students are given attendings on their own accounts or under{' '}
              <a className="underline" href="/admin/cohorts">
                Cohorts
              </a>
              .
            </p>
          </Section>
        )}
      </div>
    </dialog>
  );
}

function Section({ title, children }: { title: string; children: ReactNode }) {
  const id = `section-${title.replace(/\W+/g, '-').toLowerCase()}`;
  return (
    <section aria-labelledby={id} className="flex flex-col gap-3 rounded-lg border border-line bg-white p-4">
      <h3 id={id} className="text-lg font-bold">
        {title}
      </h3>
      {children}
    </section>
  );
}

function ActiveControls({
  account,
  self,
  onChanged,
}: {
  account: AccountSummary;
  self: boolean;
  onChanged: (a: ActiveAnswer) => void;
}) {
  const send = useWrite<ActiveAnswer>('POST');
  const [confirming, setConfirming] = useState(false);
  const [busy, setBusy] = useState(false);
  const [said, setSaid] = useState<Said>(null);

  const act = async (what: 'deactivate' | 'reactivate') => {
    setBusy(true);
    setSaid(null);
    const reply = await send(`/api/users/${account.userId}/${what}`, {});
    setBusy(false);
    setConfirming(false);
    if (reply.ok && reply.body) {
      setSaid({
        kind: 'done',
        text:
          what === 'deactivate'
            ? `${account.name} is deactivated; ${sessions(reply.body.sessionsEnded)} ended.`
            : `${account.name} is active again and signs in afresh.`,
      });
      onChanged(reply.body);
    } else setSaid({ kind: 'error', text: reply.error?.error ?? 'Nothing was changed.' });
  };

  if (self) return <p>You are signed in as this account. You cannot deactivate it yourself; another director can.</p>;
  return (
    <div className="flex flex-col gap-2">
      {account.active ? (
        confirming ? (
          <div className="flex flex-col gap-2 rounded border-2 border-stop p-3">
            <p>
              Deactivating ends every session of {account.name} at once and stops them signing in. Their records stay,
              and you can re-activate the account later.
            </p>
            <div className="flex flex-wrap gap-3">
              <button type="button" className={BUTTON_DANGER} disabled={busy} onClick={() => void act('deactivate')}>
                Deactivate {account.name}
              </button>
              <button type="button" className={BUTTON_QUIET} disabled={busy} onClick={() => setConfirming(false)}>
                Keep active
              </button>
            </div>
          </div>
        ) : (
          <div>
            <button type="button" className={BUTTON_QUIET} onClick={() => setConfirming(true)}>
              Deactivate…
            </button>
          </div>
        )
      ) : (
        <div>
          <button type="button" className={BUTTON} disabled={busy} onClick={() => void act('reactivate')}>
            Re-activate {account.name}
          </button>
        </div>
      )}
      <Outcome kind={said?.kind ?? null}>{said?.text}</Outcome>
    </div>
  );
}

function HoldControls({
  account,
  heldUntil,
  onChanged,
}: {
  account: AccountSummary;
  heldUntil: (iso: string) => string;
  onChanged: () => void;
}) {
  const send = useWrite<HoldsAnswer>('POST');
  const [busy, setBusy] = useState(false);
  const [said, setSaid] = useState<Said>(null);
  const lift = async () => {
    setBusy(true);
    setSaid(null);
    const reply = await send(`/api/users/${account.userId}/holds/lift`, {});
    setBusy(false);
    if (reply.ok && reply.body) {
      setSaid({
        kind: 'done',
        text: reply.body.holdsLifted
          ? `The hold is lifted: ${account.name} can sign in with the right password now.`
          : 'There was no hold left to lift.',
      });
      onChanged();
    } else setSaid({ kind: 'error', text: reply.error?.error ?? 'Nothing was changed.' });
  };
  return (
    <div className="flex flex-col gap-2">
      {account.heldUntil ? (
        <>
          <p>
            <strong className="text-caution">▲ Sign-in held</strong> until {heldUntil(account.heldUntil)} after too many
            wrong passwords.
          </p>
          <div>
            <button type="button" className={BUTTON} disabled={busy} onClick={() => void lift()}>
              Lift the sign-in hold
            </button>
          </div>
        </>
      ) : (
        <p className="text-muted">No sign-in hold.</p>
      )}
      <Outcome kind={said?.kind ?? null}>{said?.text}</Outcome>
    </div>
  );
}
