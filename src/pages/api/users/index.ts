import type { APIRoute } from 'astro';
import { accountSummaries } from '../../../lib/server/accounts';
import { answer } from '../../../lib/server/admin-answers';
import { directorRead } from '../../../lib/server/admin-route';

/** Every account with its cohort, assignments and sign-in hold (directors; docs/accounts.md). */
export const GET: APIRoute = (ctx) =>
  directorRead(ctx, async (k) => answer(200, { accounts: await accountSummaries(k) }));
