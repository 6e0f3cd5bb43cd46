/**
 * What the invitation, reset and director's invitations pages show, read through one service
 * each so that no page opens the database itself. The two link pages count each view against
 * the client's address and the link (public-limits.ts) before looking the token up.
 */
import { formatInstant } from '../present/format';
import { roleLabel } from '../present/labels';
import type { InvitationView } from '../account-forms';
import { lookupHash } from './account-tokens';
import { config } from './config';
import { db } from './db';
import { INVITATION_GONE, invitationForLink } from './invitation-accept';
import { invitationsPageData } from './invitations';
import { RESET_REFUSAL, resetForLink } from './password-resets';
import { countRequest } from './public-limits';

/** The headers every page with a token in its address sends: no Referer, no copy kept. */
export const TOKEN_PAGE_HEADERS = { 'Referrer-Policy': 'no-referrer', 'Cache-Control': 'no-store' } as const;

export type LinkPage<T> = { status: 200; data: T } | { status: 404 | 409 | 410 | 429; message: string };

/** The invitation page: the invitation a link offers, or why it cannot be used. */
export async function invitationPage(
  token: string,
  address: string,
): Promise<LinkPage<{ email: string; role: string; name: string; cohortName: string | null; expires: string }>> {
  const k = await db();
  const counted = await countRequest(k, 'token-page', address, lookupHash(token));
  if (counted.addressWait + counted.targetWait > 0) {
    return { status: 429, message: 'This link was opened too often just now. Wait a few minutes and try again.' };
  }
  const link = await invitationForLink(k, token);
  switch (link.status) {
    case 'unknown':
      return { status: 404, message: 'This invitation link is not valid. Check that you copied all of it.' };
    case 'accepted':
    case 'expired':
    case 'revoked':
      return { status: 410, message: INVITATION_GONE[link.status] };
    case 'pending':
      return {
        status: 200,
        data: {
          email: link.email,
          role: roleLabel(link.role),
          name: link.name ?? '',
          cohortName: link.cohortName,
          expires: formatInstant(link.expiresAt, config().clinic, 'dateTime'),
        },
      };
  }
}

/** The reset page: until when the link works, or why it cannot be used. */
export async function resetPage(token: string, address: string): Promise<LinkPage<{ expires: string }>> {
  const k = await db();
  const counted = await countRequest(k, 'token-page', address, lookupHash(token));
  if (counted.addressWait + counted.targetWait > 0) {
    return { status: 429, message: 'This link was opened too often just now. Wait a few minutes and try again.' };
  }
  const link = await resetForLink(k, token);
  if (link.status !== 'usable') {
    const refusal = RESET_REFUSAL[link.status];
    return { status: refusal.status, message: refusal.error };
  }
  return { status: 200, data: { expires: formatInstant(link.expiresAt!, config().clinic, 'time') } };
}

/** The director's invitations page. */
export async function invitationsAdminPage(): Promise<{
  cohorts: { id: number; name: string }[];
  attendings: { id: number; name: string }[];
  invitations: InvitationView[];
  clinic: { timeZone: string; locale: string };
}> {
  return { ...(await invitationsPageData(await db())), clinic: config().clinic };
}
