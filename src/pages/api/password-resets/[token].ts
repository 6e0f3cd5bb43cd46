import type { APIRoute } from 'astro';
import { resetConfirmSchema } from '../../../lib/account-forms';
import { lookupHash } from '../../../lib/server/account-tokens';
import { parseJsonBody } from '../../../lib/server/api-body';
import { db } from '../../../lib/server/db';
import { json } from '../../../lib/server/http';
import { confirmReset } from '../../../lib/server/password-resets';
import { countRequest, tooMany } from '../../../lib/server/public-limits';

/**
 * Public: sets the password a reset link is for, `{ id, password }`; every session of the
 * account ends and its sign-in holds are lifted. Signs nobody in (docs/accounts.md).
 */
export const POST: APIRoute = async ({ request, params, clientAddress }) => {
  const body = await parseJsonBody(request, resetConfirmSchema, 2048);
  if (!body.ok) return body.response;
  const token = params.token ?? '';
  const k = await db();
  const counted = await countRequest(k, 'reset-confirm', clientAddress, lookupHash(token));
  if (counted.addressWait + counted.targetWait > 0) return tooMany(Math.max(counted.addressWait, counted.targetWait));
  const answer = await confirmReset(k, token, body.value);
  return json(answer.body, answer.status);
};
