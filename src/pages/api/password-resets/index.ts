import type { APIRoute } from 'astro';
import { resetRequestSchema } from '../../../lib/account-forms';
import { parseJsonBody } from '../../../lib/server/api-body';
import { db } from '../../../lib/server/db';
import { json } from '../../../lib/server/http';
import { acceptResetRequest } from '../../../lib/server/password-resets';

/**
 * Public: asks for a reset link, `{ id, email }`. Always the same 202 (or 429 for an address
 * over its limit), before the address is looked up (docs/accounts.md).
 */
export const POST: APIRoute = async ({ request, clientAddress }) => {
  const body = await parseJsonBody(request, resetRequestSchema, 1024);
  if (!body.ok) return body.response;
  const answer = await acceptResetRequest(await db(), body.value, clientAddress);
  return answer instanceof Response ? answer : json(answer.body, answer.status);
};
