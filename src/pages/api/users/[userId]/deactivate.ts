import type { APIRoute } from 'astro';
import { userActionSchema } from '../../../../lib/contract-accounts';
import { deactivate } from '../../../../lib/server/accounts';
import { directorWrite, noSuchRow, rowParam } from '../../../../lib/server/admin-route';

/** Deactivates an account: every session ends; refused for yourself and the last active director. */
export const POST: APIRoute = (ctx) => {
  const userId = rowParam(ctx.params.userId);
  if (userId === null) return noSuchRow('account');
  return directorWrite(ctx, userActionSchema, `user.deactivate ${userId}`, (k, user) => deactivate(k, user, userId));
};
