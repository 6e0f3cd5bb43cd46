import type { APIRoute } from 'astro';
import { parseJsonBody } from '../../../lib/server/api-body';
import { etagMatches } from '../../../lib/server/cases';
import { db } from '../../../lib/server/db';
import { json, jsonError } from '../../../lib/server/http';
import { once } from '../../../lib/server/request-ids';
import { readSettings } from '../../../lib/server/settings';
import { ifMatchVersion, putSettings, settingsAnswer, settingsEtag } from '../../../lib/server/settings-service';
import { settingsErrorField, settingsPutSchema } from '../../../lib/settings-contract';

/** Every setting by name and the version, to any signed-in user (docs/settings.md); ETag = version. */
export const GET: APIRoute = async ({ locals, request }) => {
  if (!locals.user) return jsonError(401, 'Sign in first.');
  const settings = await readSettings(await db());
  const etag = settingsEtag(settings.version);
  if (etagMatches(request.headers.get('if-none-match'), etag))
    return new Response(null, { status: 304, headers: { 'Cache-Control': 'no-store', ETag: etag } });
  const res = json(settingsAnswer(settings));
  res.headers.set('ETag', etag);
  return res;
};

/**
 * A director's change of some settings, made to the version named in If-Match: 428 without
 * it, 409 when it is no longer the version in force, 400 naming the field for a value out of
 * its range or a name that is no setting. The same id again answers the first answer.
 */
export const PUT: APIRoute = async ({ locals, request }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  if (user.role !== 'director') return jsonError(403, 'Only a director may change the course settings.');
  const body = await parseJsonBody(request, settingsPutSchema, 16_384, settingsErrorField);
  if (!body.ok) return body.response;
  const version = ifMatchVersion(request.headers.get('if-match'));
  if (version === null)
    return jsonError(
      428,
      'Send the version of the settings you changed in If-Match (the ETag GET /api/settings sent).',
      {
        code: 'if-match-required',
      },
    );
  const k = await db();
  const input = body.value;
  const answer = await once(
    k,
    { userId: user.id, id: input.id, route: 'settings.put', body: { ...input, ifMatch: version } },
    () => putSettings(k, user, input, version),
  );
  const res = json(answer.body, answer.status);
  if (answer.status === 200) res.headers.set('ETag', settingsEtag(Number(answer.body.version)));
  return res;
};
