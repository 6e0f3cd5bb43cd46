import type { APIRoute } from 'astro';
import { db } from '../../../lib/server/db';
import { json, jsonError } from '../../../lib/server/http';
import { readableCase, UUID_RE } from '../../../lib/server/access';
import { storedCanal } from '../../../lib/server/canal-store';

export const GET: APIRoute = async ({ params, locals }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  const canalId = params.canalId ?? '';
  const notFound = () => jsonError(404, 'No such canal.');
  if (!UUID_RE.test(canalId)) return notFound();
  const k = await db();
  const canal = await storedCanal(k, canalId);
  if (!canal || !(await readableCase(k, user, canal.caseId))) return notFound();
  return json(canal);
};
