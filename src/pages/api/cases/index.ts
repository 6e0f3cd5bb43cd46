import type { APIRoute } from 'astro';
import { caseListQuerySchema, queryObject } from '../../../lib/contract-case-list';
import { fieldOf } from '../../../lib/server/api-body';
import { findCases } from '../../../lib/server/case-list';
import { config } from '../../../lib/server/config';
import { db } from '../../../lib/server/db';
import { json, jsonError } from '../../../lib/server/http';
import { formatZodError } from '../../../lib/rules/index';

/**
 * The cases the user may read, newest first. With no query it answers every one (the tablet's
 * list, as always); the query filters them and, with `limit` or `cursor`, pages them
 * (docs/sync-contract.md, "GET /api/cases").
 */
export const GET: APIRoute = async ({ locals, url }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  const parsed = caseListQuerySchema.safeParse(queryObject(url.searchParams));
  if (!parsed.success) return jsonError(400, formatZodError(parsed.error), { field: fieldOf(parsed.error) });
  const query = parsed.data;
  const paged = query.limit !== undefined || query.cursor !== undefined;
  const found = await findCases(await db(), user, query, { timeZone: config().clinic.timeZone, paged });
  if (!found.ok) return jsonError(400, found.error, { field: found.field });
  return json(found.answer);
};
