/** What the director's account and cohort pages load with them (pages never open the database). */
import type { AccountSummary, CohortSummary } from '../contract';
import { accountSummaries } from './accounts';
import { cohortSummaries } from './cohorts';
import { db } from './db';

export async function accountsAndCohorts(): Promise<{ accounts: AccountSummary[]; cohorts: CohortSummary[] }> {
  const k = await db();
  return { accounts: await accountSummaries(k), cohorts: await cohortSummaries(k) };
}
