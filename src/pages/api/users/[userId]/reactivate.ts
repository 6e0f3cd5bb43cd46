import type { APIRoute } from 'astro';
import { userActionSchema } from '../../../../lib/contract-accounts';
import { reactivate } from '../../../../lib/server/accounts';
import { directorWrite, noSuchRow, rowParam } from '../../../../lib/server/admin-route';

/** Re-activates an account; the person signs in again (no old session returns). */
export const POST: APIRoute = (ctx) => {
  const userId = rowParam(ctx.params.userId);
  if (userId === null) return noSuchRow('account');
  return directorWrite(ctx, userActionSchema, `user.reactivate ${userId}`, (k, user) => reactivate(k, user, userId));
};
