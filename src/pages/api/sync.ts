import type { APIRoute } from 'astro';
import { z } from 'zod';
import { LIMITS } from '../../lib/rules/index';
import { db } from '../../lib/server/db';
import { isJson, json, jsonError, sameOrigin } from '../../lib/server/http';
import { ingestBatch } from '../../lib/server/sync';
import { readBody } from '../../lib/server/body';
import { requireRole } from '../../lib/server/guard';

const MAX_BYTES = LIMITS.bytesPerBatch;
const MAX_EVENTS = LIMITS.eventsPerBatch;

const batchSchema = z.object({
  deviceId: z.string().trim().min(1, 'deviceId is required').max(80, 'deviceId must be at most 80 characters'),
  // The account the tablet's outbox belongs to. When given, a batch is refused under anyone
  // else's session, so a sign-in in another tab mid-sync cannot take over the events.
  userId: z.number({ invalid_type_error: 'userId must be a number' }).int().positive().optional(),
  events: z.array(z.unknown(), { required_error: 'events is required', invalid_type_error: 'events must be a list' }),
});

export const POST: APIRoute = async (ctx) => {
  const { request, locals } = ctx;
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  if (!sameOrigin(request)) return jsonError(403, 'This request did not come from Coneline.');
  const denied = await requireRole(ctx, ['student']);
  if (denied) return denied;
  if (!isJson(request)) return jsonError(415, 'Send the batch as application/json.');

  let body: { text: string; tooLarge: boolean };
  try {
    body = await readBody(request, MAX_BYTES);
  } catch {
    return jsonError(400, 'The body could not be read.');
  }
  if (body.tooLarge) return jsonError(413, 'The batch is over 1 MB; send fewer events at a time.');
  let raw: unknown;
  try {
    raw = JSON.parse(body.text);
  } catch {
    return jsonError(400, 'The body is not valid JSON.');
  }
  if (
    Array.isArray((raw as { events?: unknown })?.events) &&
    (raw as { events: unknown[] }).events.length > MAX_EVENTS
  ) {
    return jsonError(413, `A batch holds at most ${MAX_EVENTS} events.`);
  }
  const batch = batchSchema.safeParse(raw);
  if (!batch.success) return jsonError(400, `Not a sync batch: ${batch.error.issues[0]?.message ?? 'wrong shape'}.`);

  if (batch.data.userId !== undefined && batch.data.userId !== user.id) {
    return jsonError(403, 'These events belong to another account: sign in as that user to send them.', {
      code: 'other-user',
    });
  }

  try {
    return json(await ingestBatch(await db(), user.id, batch.data.deviceId, batch.data.events));
  } catch (err) {
    // A database fault, not the batch: nothing was stored (one transaction). Log no values:
    // SQL errors can carry event data such as chart numbers.
    console.error(
      `[sync] batch of ${batch.data.events.length} events not stored: ${(err as { code?: string }).code ?? (err as Error).name}`,
    );
    return jsonError(
      500,
      'The server could not store this batch; nothing was stored, and the tablet will send it again.',
    );
  }
};
