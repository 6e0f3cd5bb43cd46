import type { APIRoute } from 'astro';
import { db } from '../../../lib/server/db';
import { jsonError } from '../../../lib/server/http';
import { UUID_RE } from '../../../lib/server/access';
import { readCaseIfChanged } from '../../../lib/server/cases';
import type { CaseDetail as CaseDetailAnswer } from '../../../lib/contract';

// Health data: never kept in the browser's HTTP cache (a shared clinic tablet). The island
// keeps its own copy in IndexedDB with the ETag and revalidates with If-None-Match itself
// (docs/sync-contract.md, "Reading back").
const NO_STORE = { 'Cache-Control': 'no-store' };

export const GET: APIRoute = async ({ params, locals, request }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  const caseId = params.caseId ?? '';
  const read = UUID_RE.test(caseId)
    ? await readCaseIfChanged(await db(), user, caseId, request.headers.get('if-none-match'))
    : ({ kind: 'missing' } as const);
  if (read.kind === 'missing') return jsonError(404, 'No such case.');
  if (read.kind === 'unchanged') return new Response(null, { status: 304, headers: { ...NO_STORE, ETag: read.etag } });
  const { detail } = read;
  return Response.json(
    {
      caseId: detail.caseId,
      reviewStatus: detail.case.review_status,
      events: detail.events,
      canals: detail.canals,
      signoffs: detail.signoffs,
      comments: detail.comments,
      settingsVersion: detail.settingsVersion,
    } satisfies CaseDetailAnswer,
    { headers: { ...NO_STORE, ETag: read.etag } },
  );
};
