import type { APIRoute } from 'astro';
import { cohortCreateSchema } from '../../../lib/contract-accounts';
import { answer } from '../../../lib/server/admin-answers';
import { directorRead, directorWrite } from '../../../lib/server/admin-route';
import { cohortSummaries, createCohort } from '../../../lib/server/cohorts';

/** Every cohort, in use first, with its count of students (directors). */
export const GET: APIRoute = (ctx) =>
  directorRead(ctx, async (k) => answer(200, { cohorts: await cohortSummaries(k) }));

/** Creates a cohort: 201, or 409 when the name is taken. */
export const POST: APIRoute = (ctx) =>
  directorWrite(ctx, cohortCreateSchema, 'cohort.create', (k, user, input) => createCohort(k, user, input));
