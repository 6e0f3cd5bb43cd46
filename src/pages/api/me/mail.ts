import type { APIRoute } from 'astro';
import { parseJsonBody } from '../../../lib/server/api-body';
import { db } from '../../../lib/server/db';
import { json, jsonError } from '../../../lib/server/http';
import { mailPreferenceSchema, setMailPreference, takesDigest } from '../../../lib/server/mail-preference';
import { once } from '../../../lib/server/request-ids';

/** The signed-in user's choice of review e-mail: `{ digest }` (docs/review.md). */
export const GET: APIRoute = async ({ locals }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  return json({ digest: await takesDigest(await db(), user.id) });
};

/** One e-mail each (`digest: false`) or one a day (`digest: true`). */
export const POST: APIRoute = async ({ locals, request }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  const body = await parseJsonBody(request, mailPreferenceSchema, 1024);
  if (!body.ok) return body.response;
  const k = await db();
  const input = body.value;
  const answer = await once(k, { userId: user.id, id: input.id, route: 'me.mail', body: input }, () =>
    setMailPreference(k, user.id, input),
  );
  return json(answer.body, answer.status);
};
