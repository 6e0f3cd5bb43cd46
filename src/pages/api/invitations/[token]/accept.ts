import type { APIRoute } from 'astro';
import { acceptSchema } from '../../../../lib/account-forms';
import { lookupHash } from '../../../../lib/server/account-tokens';
import { parseJsonBody } from '../../../../lib/server/api-body';
import { db } from '../../../../lib/server/db';
import { json } from '../../../../lib/server/http';
import { acceptInvitation } from '../../../../lib/server/invitation-accept';
import { countRequest, tooMany } from '../../../../lib/server/public-limits';

/**
 * Public: the holder of an invitation link makes their account, `{ id, name, password }`
 * (docs/accounts.md). Signs nobody in; the answer names the sign-in page.
 */
export const POST: APIRoute = async ({ request, params, clientAddress }) => {
  const body = await parseJsonBody(request, acceptSchema, 4096);
  if (!body.ok) return body.response;
  const token = params.token ?? '';
  const k = await db();
  const counted = await countRequest(k, 'invite-accept', clientAddress, lookupHash(token));
  if (counted.addressWait + counted.targetWait > 0) return tooMany(Math.max(counted.addressWait, counted.targetWait));
  const answer = await acceptInvitation(k, token, body.value);
  return json(answer.body, answer.status);
};
