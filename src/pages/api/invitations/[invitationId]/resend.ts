import { invitationAction } from '../../../../lib/server/invitation-action';
import { resendInvitation } from '../../../../lib/server/invitations';

/** Sends a pending or expired invitation again with a new link; the old link stops working. Body: `{ id }`. */
export const POST = invitationAction('invitations.resend', (k, director, invitationId) =>
  resendInvitation(k, director, invitationId),
);
