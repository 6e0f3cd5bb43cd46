import type { APIRoute } from 'astro';
import { parseJsonBody } from '../../../lib/server/api-body';
import { db } from '../../../lib/server/db';
import { requireRole } from '../../../lib/server/guard';
import { json } from '../../../lib/server/http';
import { once } from '../../../lib/server/request-ids';
import { recomputeStatus, startRecomputeAll } from '../../../lib/server/settings-service';
import { recomputePostSchema } from '../../../lib/settings-contract';

/** How far the background re-judging has come: done of total, started, finished (director). */
export const GET: APIRoute = async (ctx) => {
  const denied = await requireRole(ctx, ['director']);
  if (denied) return denied;
  return json(await recomputeStatus(await db()));
};

/** Starts judging every unlocked canal again (director); 202 with the progress. The same id again answers the first answer. */
export const POST: APIRoute = async (ctx) => {
  const denied = await requireRole(ctx, ['director']);
  if (denied) return denied;
  const user = ctx.locals.user!;
  const body = await parseJsonBody(ctx.request, recomputePostSchema, 1024);
  if (!body.ok) return body.response;
  const k = await db();
  const answer = await once(
    k,
    { userId: user.id, id: body.value.id, route: 'settings.recompute', body: body.value },
    () => startRecomputeAll(k, user),
  );
  return json(answer.body, answer.status);
};
