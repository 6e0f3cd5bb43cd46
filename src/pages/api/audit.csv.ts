import type { APIRoute } from 'astro';
import { auditCsv, auditCsvName, parseAuditQuery } from '../../lib/server/audit-log';
import { config } from '../../lib/server/config';
import { db } from '../../lib/server/db';
import { requireRole } from '../../lib/server/guard';
import { jsonError } from '../../lib/server/http';

/** Every line of the audit log that matches the filters of /admin/audit, as CSV, newest first (director). */
export const GET: APIRoute = async (ctx) => {
  const denied = await requireRole(ctx, ['director']);
  if (denied) return denied;
  const q = parseAuditQuery(ctx.url.searchParams);
  if (!q.ok) return jsonError(400, q.error, q.field ? { field: q.field } : undefined);
  const clinic = config().clinic;
  return new Response(auditCsv(await db(), q.query, clinic), {
    headers: {
      'Content-Type': 'text/csv; charset=utf-8',
      'Content-Disposition': `attachment; filename="${auditCsvName(new Date(), clinic)}"`,
      'Cache-Control': 'no-store',
    },
  });
};
