import type { APIRoute } from 'astro';
import { roleChangeSchema } from '../../../../lib/contract-accounts';
import { changeRole } from '../../../../lib/server/accounts';
import { directorWrite, noSuchRow, rowParam } from '../../../../lib/server/admin-route';

/** Changes an account's role, removing the assignments of the old role (docs/accounts.md). */
export const POST: APIRoute = (ctx) => {
  const userId = rowParam(ctx.params.userId);
  if (userId === null) return noSuchRow('account');
  return directorWrite(ctx, roleChangeSchema, `user.role ${userId}`, (k, user, input) =>
    changeRole(k, user, userId, input.role),
  );
};
