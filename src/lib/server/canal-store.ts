/** Reads and writes the derived canal rows: state, status and findings, from the rules core. */
import type { Knex } from 'knex';
import { evaluateCanal, type CanalResult, type LogEvent, type Tolerances } from '../rules/index';
import { withStatements } from './prepared';
import { tolerances } from './settings';

/** Status of a canal whose canal.added was withdrawn. */
export const REMOVED = 'removed';

interface EventRow {
  id: string;
  case_id: string;
  canal_id: string | null;
  type: string;
  at: string;
  data_json: string;
}

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
  const rows = await k<EventRow>('events')
    .select('id', 'case_id', 'canal_id', 'type', 'at', 'data_json')
    .where({ case_id: caseId });
  return rows.map(rowToEvent);
}

/**
 * The case-level events of a case and the events of the given canals, by canal: all a canal's
 * rules see (its canal.added names its case; a void counts only in its own scope).
 */
async function eventsFor(
  k: Knex,
  caseId: string,
  canalIds: readonly string[],
): Promise<{ caseLevel: LogEvent[]; byCanal: Map<string, LogEvent[]> }> {
  const select = () =>
    k<EventRow>('events').select('id', 'case_id', 'canal_id', 'type', 'at', 'data_json').where({ case_id: caseId });
  const rows: EventRow[] = await select().whereNull('canal_id');
  // Chunks keep each query under SQLite's limit on bound values.
  for (let i = 0; i < canalIds.length; i += 400)
    rows.push(...(await select().whereIn('canal_id', canalIds.slice(i, i + 400))));
  const caseLevel: LogEvent[] = [];
  const byCanal = new Map<string, LogEvent[]>(canalIds.map((id) => [id, []]));
  for (const r of rows) {
    if (r.canal_id === null) caseLevel.push(rowToEvent(r));
    else byCanal.get(r.canal_id)?.push(rowToEvent(r));
  }
  return { caseLevel, byCanal };
}

/**
 * Recomputes and stores the given canals of one case; returns their results. Each canal is
 * evaluated with its own events and the case-level ones only, so a batch that touched one
 * canal reads and judges that canal, not the whole case.
 */
export async function recomputeCanals(
  k: Knex,
  caseId: string,
  canalIds: Iterable<string>,
  tol?: Tolerances,
): Promise<CanalResult[]> {
  const ids = [...canalIds];
  const { caseLevel, byCanal } = await eventsFor(k, caseId, ids);
  const t = tol ?? (await tolerances(k));
  const out: CanalResult[] = [];
  for (const canalId of ids) {
    const result = evaluateCanal(canalId, [...caseLevel, ...(byCanal.get(canalId) ?? [])], t);
    if (!result) {
      // Its canal.added was voided: the canal no longer exists for the rules or the reader.
      await k('findings').where({ canal_id: canalId }).delete();
      await k('canals')
        .where({ id: canalId })
        .update({ status: REMOVED, stops: 0, cautions: 0, notes: 0, updated_at: k.fn.now() });
      continue;
    }
    const count = (s: string) => result.findings.filter((f) => f.severity === s).length;
    await k('canals')
      .where({ id: canalId })
      .update({
        status: result.state.status,
        name: result.state.name,
        state_json: JSON.stringify(result.state),
        stops: count('stop'),
        cautions: count('caution'),
        notes: count('note'),
        updated_at: k.fn.now(),
      });
    await k('findings').where({ canal_id: canalId }).delete();
    const rows = result.findings.map((f) => ({
      canal_id: canalId,
      case_id: caseId,
      code: f.code,
      severity: f.severity,
      event_id: f.eventId ?? null,
      message: f.message,
    }));
    // SQLite takes at most 500 rows in one multi-row insert; a canal can have more findings.
    for (let i = 0; i < rows.length; i += 100) await k('findings').insert(rows.slice(i, i + 100));
    out.push(result);
  }
  return out;
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
  if (reviewStatus !== 'approved' && reviewStatus !== 'returned') return result;
  return { ...result, state: { ...result.state, status: reviewStatus as CanalResult['state']['status'] } };
}
