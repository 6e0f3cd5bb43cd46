import type { APIRoute } from 'astro';
import { cohortUpdateSchema } from '../../../lib/contract-accounts';
import { directorWrite, noSuchRow, rowParam } from '../../../lib/server/admin-route';
import { updateCohort } from '../../../lib/server/cohorts';

/** Renames a cohort, sets its class year, archives it or brings it back. */
export const PATCH: APIRoute = (ctx) => {
  const cohortId = rowParam(ctx.params.cohortId);
  if (cohortId === null) return noSuchRow('cohort');
  return directorWrite(ctx, cohortUpdateSchema, `cohort.update ${cohortId}`, (k, user, input) =>
    updateCohort(k, user, cohortId, input),
  );
};
