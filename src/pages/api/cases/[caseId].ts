import type { APIRoute } from 'astro';
import { db } from '../../../lib/server/db';
import { json, jsonError } from '../../../lib/server/http';
import { UUID_RE } from '../../../lib/server/access';
import { caseDetail } from '../../../lib/server/cases';

export const GET: APIRoute = async ({ params, locals }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  const caseId = params.caseId ?? '';
  const detail = UUID_RE.test(caseId) ? await caseDetail(await db(), user, caseId) : null;
  if (!detail) return jsonError(404, 'No such case.');
  return json({ caseId: detail.caseId, events: detail.events, canals: detail.canals });
};
