import { invitationAction } from '../../../../lib/server/invitation-action';
import { revokeInvitation } from '../../../../lib/server/invitations';

/** Revokes an invitation that is not accepted; its link stops working. Body: `{ id }`. */
export const POST = invitationAction('invitations.revoke', (k, director, invitationId) =>
  revokeInvitation(k, director, invitationId),
);
