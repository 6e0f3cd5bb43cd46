import type { APIRoute } from 'astro';
import { cohortMoveSchema } from '../../../../lib/contract-accounts';
import { directorWrite, noSuchRow, rowParam } from '../../../../lib/server/admin-route';
import { moveStudent } from '../../../../lib/server/cohorts';

/** Moves a student into a cohort in use, or out of every cohort (`cohortId: null`). */
export const POST: APIRoute = (ctx) => {
  const userId = rowParam(ctx.params.userId);
  if (userId === null) return noSuchRow('account');
  return directorWrite(ctx, cohortMoveSchema, `user.cohort ${userId}`, (k, user, input) =>
    moveStudent(k, user, userId, input.cohortId),
  );
};
