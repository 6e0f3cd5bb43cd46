/**
 * Reads the derived canal rows (state, status and findings) as the API answers them. The
 * projection (projection.ts) is their only writer.
 */
import type { Knex } from 'knex';
import { REVIEW_STATES_SHOWN_ON_CANALS, type CanalResult, type CaseState, type LogEvent } from '../rules/index';
import { withStatements } from './prepared';
import type { EventRow as StoredEventRow } from './tables';

/** Status of a canal whose canal.added was withdrawn. */
export const REMOVED = 'removed';

/**
 * SQL that is 1 for a canal row with no seated master cone (`isUnfilled` of present/labels.ts
 * on the stored state): a state judged before rules version 2 has no `unfilled`, and then its
 * master cone's `seated` answers. Reads `state_json` of the canal row in scope.
 */
export const UNFILLED_SQL =
  "coalesce(json_extract(state_json, '$.unfilled'), 1 - coalesce(json_extract(state_json, '$.masterCone.seated'), 0))";

/** The columns of an event row the rules need. */
export type EventRow = Pick<StoredEventRow, 'id' | 'case_id' | 'canal_id' | 'type' | 'at' | 'data_json'>;

export function rowToEvent(r: EventRow): LogEvent {
  const e: Record<string, unknown> = {
    id: r.id,
    caseId: r.case_id,
    type: r.type,
    at: r.at,
    data: JSON.parse(r.data_json),
  };
  if (r.canal_id) e.canalId = r.canal_id;
  return e as unknown as LogEvent;
}

export async function caseEvents(k: Knex, caseId: string): Promise<LogEvent[]> {
  const rows = await k('events')
    .select('id', 'case_id', 'canal_id', 'type', 'at', 'data_json')
    .where({ case_id: caseId });
  return rows.map(rowToEvent);
}

interface CanalRow {
  id: string;
  case_id: string;
  state_json: string;
  review_status?: string;
}

interface FindingRow {
  canal_id: string;
  code: string;
  severity: string;
  event_id: string | null;
  message: string;
}

/** Stored canal rows (with their case's review status) and their findings, as the API answers them. */
function toResults(rows: CanalRow[], findings: FindingRow[]): CanalResult[] {
  return rows.map((row) =>
    withReviewStatus(
      {
        canalId: row.id,
        caseId: row.case_id,
        state: JSON.parse(row.state_json) as CanalResult['state'],
        findings: findings
          .filter((f) => f.canal_id === row.id)
          .map((f) => ({
            code: f.code,
            severity: f.severity,
            ...(f.event_id ? { eventId: f.event_id } : {}),
            message: f.message,
          })) as CanalResult['findings'],
      },
      row.review_status ?? 'open',
    ),
  );
}

const CANAL = `select canals.id, canals.case_id, canals.state_json, cases.review_status from canals
  inner join cases on cases.id = canals.case_id where canals.status <> '${REMOVED}' and canals.id = ?`;
const CANAL_FINDINGS =
  'select canal_id, code, severity, event_id, message from findings where canal_id = ? order by id';

/**
 * The stored canal as the API answers it; the review states come from the sign-offs. Read on
 * every canal request (and by each tablet's sync loop), so two prepared statements.
 */
export function storedCanal(k: Knex, canalId: string): Promise<CanalResult | null> {
  return withStatements(k, (prepare) => {
    const row = prepare(CANAL).get(canalId) as CanalRow | undefined;
    if (!row) return null;
    return toResults([row], prepare(CANAL_FINDINGS).all(canalId) as FindingRow[])[0] ?? null;
  });
}

/** Every stored canal of a case, in two queries. */
export async function storedCanalsOfCase(k: Knex, caseId: string): Promise<CanalResult[]> {
  const rows = (await k<CanalRow>('canals')
    .join('cases', 'cases.id', 'canals.case_id')
    .select('canals.id', 'canals.case_id', 'canals.state_json', 'cases.review_status')
    .whereNot('canals.status', REMOVED)
    .where('canals.case_id', caseId)
    .orderBy('canals.id')) as CanalRow[];
  if (rows.length === 0) return [];
  const findings = (await k('findings')
    .select('canal_id', 'code', 'severity', 'event_id', 'message')
    .whereIn(
      'canal_id',
      rows.map((r) => r.id),
    )
    .orderBy('id')) as FindingRow[];
  return toResults(rows, findings);
}

/**
 * The canal as readers see it: the review states (approved, returned) come from the case's
 * sign-offs, not from the events, and replace the rules' status (rules.md, derived state).
 */
export function withReviewStatus(result: CanalResult, reviewStatus: string): CanalResult {
  if (!REVIEW_STATES_SHOWN_ON_CANALS.includes(reviewStatus as CaseState)) return result;
  return { ...result, state: { ...result.state, status: reviewStatus as CanalResult['state']['status'] } };
}
