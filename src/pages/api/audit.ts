import type { APIRoute } from 'astro';
import { auditPage, parseAuditQuery } from '../../lib/server/audit-log';
import { config } from '../../lib/server/config';
import { db } from '../../lib/server/db';
import { requireRole } from '../../lib/server/guard';
import { json, jsonError } from '../../lib/server/http';

/** The audit log, newest first, one page behind a cursor, with the filters of /admin/audit (director). */
export const GET: APIRoute = async (ctx) => {
  const denied = await requireRole(ctx, ['director']);
  if (denied) return denied;
  const q = parseAuditQuery(ctx.url.searchParams);
  if (!q.ok) return jsonError(400, q.error, q.field ? { field: q.field } : undefined);
  return json(await auditPage(await db(), q.query, config().clinic));
};
