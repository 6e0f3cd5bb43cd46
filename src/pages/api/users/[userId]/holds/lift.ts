import type { APIRoute } from 'astro';
import { userActionSchema } from '../../../../../lib/contract-accounts';
import { liftAccountHolds } from '../../../../../lib/server/accounts';
import { directorWrite, noSuchRow, rowParam } from '../../../../../lib/server/admin-route';

/** Lifts every sign-in hold on the account, from any address. */
export const POST: APIRoute = (ctx) => {
  const userId = rowParam(ctx.params.userId);
  if (userId === null) return noSuchRow('account');
  return directorWrite(ctx, userActionSchema, `user.holds.lift ${userId}`, (k, user) =>
    liftAccountHolds(k, user, userId),
  );
};
