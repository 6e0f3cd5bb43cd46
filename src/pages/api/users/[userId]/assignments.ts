import type { APIRoute } from 'astro';
import { assignmentsSchema } from '../../../../lib/contract-accounts';
import { directorRead, directorWrite, noSuchRow, rowParam } from '../../../../lib/server/admin-route';
import { setAssignments, studentAssignments } from '../../../../lib/server/assignments';

/** The student's attendings. */
export const GET: APIRoute = (ctx) => {
  const userId = rowParam(ctx.params.userId);
  if (userId === null) return noSuchRow('account');
  return directorRead(ctx, (k, user) => studentAssignments(k, user, userId));
};

/** Sets the student's attendings to exactly the ids sent. */
export const PUT: APIRoute = (ctx) => {
  const userId = rowParam(ctx.params.userId);
  if (userId === null) return noSuchRow('account');
  return directorWrite(ctx, assignmentsSchema, `user.assignments ${userId}`, (k, user, input) =>
    setAssignments(k, user, userId, input.attendingIds),
  );
};
