import type { APIRoute } from 'astro';
import { db } from '../../../lib/server/db';
import { json, jsonError } from '../../../lib/server/http';
import { mayUseQueue, reviewQueue } from '../../../lib/server/review-queue';
import { parseQueueQuery } from '../../../lib/server/review-queue-query';

/** One page of the review queue for an attending (their students' cases) or a director (docs/review.md). */
export const GET: APIRoute = async ({ locals, url }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  if (!mayUseQueue(user)) return jsonError(403, 'The review queue is for attendings and directors.');
  const query = parseQueueQuery(url.searchParams);
  if (!query.ok) return jsonError(400, query.error, { field: query.field });
  return json(await reviewQueue(await db(), user, query.value));
};
