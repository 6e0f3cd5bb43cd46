/** What each case of a batch already holds, read for the limits (rules/limits.ts). No writes. */
import type { Knex } from 'knex';
import { CaseTally, tallyEvent } from '../rules/index';
import { rowToEvent } from './canal-store';

const CHUNK = 400;

/**
 * The tallies of the given cases: counts of stored events per canal and case-level, and the
 * set-ups and canal-level withdrawals that decide which canals stand (never the rest of the
 * events, so a full case costs two small queries).
 */
export async function loadTallies(k: Knex, caseIds: readonly string[]): Promise<Map<string, CaseTally>> {
  const tallies = new Map(caseIds.map((id) => [id, new CaseTally()]));
  for (let i = 0; i < caseIds.length; i += CHUNK) {
    const chunk = caseIds.slice(i, i + CHUNK);
    const counts = (await k('events')
      .select('case_id', 'canal_id')
      .count({ n: '*' })
      .whereIn('case_id', chunk)
      .groupBy('case_id', 'canal_id')) as { case_id: string; canal_id: string | null; n: number | string }[];
    for (const r of counts) tallies.get(r.case_id)!.addCount(r.canal_id, Number(r.n));
    const setUps = await k('events')
      .select('id', 'case_id', 'canal_id', 'type', 'at', 'data_json')
      .whereIn('case_id', chunk)
      .whereNotNull('canal_id')
      .whereIn('type', ['canal.added', 'event.voided']);
    for (const r of setUps) tallies.get(r.case_id)!.remember(tallyEvent(rowToEvent(r)));
  }
  return tallies;
}
