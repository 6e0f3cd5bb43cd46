/** The director's list of invitations: status, expiry, and resend or revoke for those not accepted. */
import { useState } from 'react';
import type { InvitationStatus, InvitationView } from '../../lib/account-forms';
import { FormMessage } from '../accounts/Field';
import { newRequestId, postJson } from '../accounts/ids';

const STATUS_WORDS: Record<InvitationStatus, string> = {
  pending: 'Pending',
  accepted: 'Accepted',
  expired: 'Expired',
  revoked: 'Revoked',
};
const ROLE_WORDS: Record<string, string> = { student: 'Student', attending: 'Attending', director: 'Course director' };

export interface Clinic {
  timeZone: string;
  locale: string;
}

/** An instant in the clinic's zone (the same words as src/lib/present/format.ts, kept apart from the tablet's modules). */
function when(iso: string | null, clinic: Clinic): string {
  if (!iso) return '—';
  const t = Date.parse(iso);
  if (!Number.isFinite(t)) return '—';
  return new Intl.DateTimeFormat(clinic.locale, {
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    timeZone: clinic.timeZone,
  }).format(t);
}

export function InvitationList(props: {
  invitations: InvitationView[];
  clinic: Clinic;
  onChanged: (invitation: InvitationView) => void;
}) {
  const [busy, setBusy] = useState<number | null>(null);
  const [message, setMessage] = useState<{ tone: 'error' | 'done'; text: string } | null>(null);

  const act = async (inv: InvitationView, action: 'resend' | 'revoke') => {
    setBusy(inv.invitationId);
    setMessage(null);
    const res = await postJson(`/api/invitations/${inv.invitationId}/${action}`, { id: newRequestId() });
    setBusy(null);
    if (res.status === 200) {
      const changed = res.body.invitation as InvitationView;
      props.onChanged(changed);
      setMessage({
        tone: 'done',
        text:
          action === 'resend'
            ? `A new link went to ${changed.email}; the old one no longer works.`
            : `The invitation to ${changed.email} is revoked.`,
      });
    } else {
      setMessage({
        tone: 'error',
        text: typeof res.body.error === 'string' ? res.body.error : 'That did not work. Try again.',
      });
    }
  };

  if (props.invitations.length === 0) return <p className="text-muted">No invitations yet.</p>;
  return (
    <div className="flex flex-col gap-3">
      <FormMessage tone={message?.tone ?? 'done'} message={message?.text} />
      {/* Focusable, so a keyboard can scroll a table wider than the screen (axe: scrollable-region-focusable). */}
      <div
        className="overflow-x-auto bg-white border border-line rounded-lg"
        // eslint-disable-next-line jsx-a11y/no-noninteractive-tabindex -- a labelled scrollable region, as WAI-ARIA advises
        tabIndex={0}
        role="region"
        aria-label="Table of invitations"
      >
        <table className="w-full text-left border-collapse" data-testid="invitation-list">
          <thead className="bg-paper">
            <tr>
              <th scope="col" className="p-3">
                E-mail
              </th>
              <th scope="col" className="p-3">
                Role
              </th>
              <th scope="col" className="p-3">
                Cohort
              </th>
              <th scope="col" className="p-3">
                Status
              </th>
              <th scope="col" className="p-3">
                Link works until
              </th>
              <th scope="col" className="p-3">
                Sent
              </th>
              <th scope="col" className="p-3">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {props.invitations.map((inv) => {
              const open = inv.status === 'pending' || inv.status === 'expired';
              return (
                <tr key={inv.invitationId} className="border-t border-line" data-status={inv.status}>
                  <td className="p-3">
                    {inv.email}
                    {inv.name && <span className="block text-sm text-muted">{inv.name}</span>}
                  </td>
                  <td className="p-3">{ROLE_WORDS[inv.role] ?? inv.role}</td>
                  <td className="p-3">{inv.cohortName ?? '—'}</td>
                  <td className="p-3 font-bold">{STATUS_WORDS[inv.status]}</td>
                  <td className="p-3">
                    {inv.status === 'accepted'
                      ? `accepted ${when(inv.acceptedAt, props.clinic)}`
                      : when(inv.expiresAt, props.clinic)}
                  </td>
                  <td className="p-3">{inv.sentCount}×</td>
                  <td className="p-3">
                    {open && (
                      <span className="flex gap-2">
                        <button
                          type="button"
                          className="border-2 border-ink rounded px-3 min-h-11 font-bold"
                          disabled={busy === inv.invitationId}
                          onClick={() => void act(inv, 'resend')}
                          aria-label={`Resend the invitation to ${inv.email}`}
                        >
                          Resend
                        </button>
                        <button
                          type="button"
                          className="border-2 border-stop text-stop rounded px-3 min-h-11 font-bold"
                          disabled={busy === inv.invitationId}
                          onClick={() => void act(inv, 'revoke')}
                          aria-label={`Revoke the invitation to ${inv.email}`}
                        >
                          Revoke
                        </button>
                      </span>
                    )}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </div>
  );
}
