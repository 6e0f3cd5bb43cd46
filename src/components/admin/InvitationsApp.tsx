/** The director's invitations screen (/admin/invitations): invite one, invite a CSV, the list. */
import { useCallback, useState } from 'react';
import type { InvitationView } from '../../lib/account-forms';
import { InviteCsvForm } from './InviteCsvForm';
import { InviteForm } from './InviteForm';
import { InvitationList, type Clinic } from './InvitationList';
import type { Named } from './InvitationChoices';

interface Props {
  cohorts: Named[];
  attendings: Named[];
  invitations: InvitationView[];
  clinic: Clinic;
}

export default function InvitationsApp(props: Props) {
  const [invitations, setInvitations] = useState(props.invitations);

  const put = useCallback((inv: InvitationView) => {
    setInvitations((list) => [inv, ...list.filter((i) => i.invitationId !== inv.invitationId)]);
  }, []);
  const reload = useCallback(async () => {
    const res = await fetch('/api/invitations', { credentials: 'same-origin' }).catch(() => null);
    if (!res?.ok) return;
    const body = (await res.json()) as { invitations: InvitationView[] };
    setInvitations(body.invitations);
  }, []);

  return (
    <div className="flex flex-col gap-8">
      <div className="grid gap-6 lg:grid-cols-2">
        <section aria-labelledby="invite-one-h" className="bg-white border border-line rounded-lg p-6">
          <h2 id="invite-one-h" className="text-xl font-bold mb-3">
            Invite one person
          </h2>
          <InviteForm cohorts={props.cohorts} attendings={props.attendings} onInvited={put} />
        </section>
        <section aria-labelledby="invite-csv-h" className="bg-white border border-line rounded-lg p-6">
          <h2 id="invite-csv-h" className="text-xl font-bold mb-3">
            Invite a cohort from a CSV file
          </h2>
          <InviteCsvForm cohorts={props.cohorts} attendings={props.attendings} onDone={() => void reload()} />
        </section>
      </div>
      <section aria-labelledby="invitations-h">
        <h2 id="invitations-h" className="text-xl font-bold mb-3">
          Invitations
        </h2>
        <InvitationList invitations={invitations} clinic={props.clinic} onChanged={put} />
      </section>
    </div>
  );
}
