import type { APIRoute } from 'astro';
import { db } from '../../../lib/server/db';
import { json, jsonError } from '../../../lib/server/http';
import { listCases } from '../../../lib/server/cases';

export const GET: APIRoute = async ({ locals }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  const cases = await listCases(await db(), user);
  return json({ cases });
};
