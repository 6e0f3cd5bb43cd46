/**
 * Writes straight into a test server's SQLite file for the review queue's tests: a student
 * with many cases in known states, and cone-fit events. The cone-fit event types
 * (`conefit.requested`, `conefit.approvedAtChair`) are inserted as rows, as the sync endpoint
 * stores them, so the queue's rule can be tested before and after the tablet sends them.
 */
import { randomUUID } from 'node:crypto';
import knexFactory, { type Knex } from 'knex';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import type { CaseRow, EventRow } from '../../src/lib/server/tables';

export function openDb(dbFile: string): Knex {
  return knexFactory(sqliteOptions(dbFile));
}

export async function userId(k: Knex, email: string): Promise<number> {
  const row = await k('users').where({ email }).first('id');
  if (!row) throw new Error(`no user ${email}`);
  return row.id;
}

/** A new student assigned to `attendingIds`. */
export async function addStudent(k: Knex, name: string, attendingIds: number[]): Promise<number> {
  const [row] = await k('users')
    .insert({ email: `${randomUUID()}@queue.test`, name, role: 'student' })
    .returning('id');
  const id = row!.id;
  if (attendingIds.length)
    await k('assignments').insert(attendingIds.map((a) => ({ attending_id: a, student_id: id })));
  return id;
}

export interface FixtureCanal {
  stops?: number;
  cautions?: number;
  unfilled?: boolean;
  removed?: boolean;
}

/** A case row with its canal rows, as the projection would leave them. */
export async function addCase(
  k: Knex,
  c: Pick<CaseRow, 'student_id' | 'setting' | 'tooth' | 'chart_ref' | 'opened_at' | 'submitted_at' | 'review_status'> &
    Partial<Pick<CaseRow, 'signed_off_at' | 'discarded_at'>>,
  canals: FixtureCanal[],
): Promise<string> {
  const id = randomUUID();
  await k('cases').insert({ id, signed_off_at: null, discarded_at: null, ...c });
  if (canals.length)
    await k('canals').insert(
      canals.map((canal, i) => ({
        id: randomUUID(),
        case_id: id,
        name: `C${i + 1}`,
        status: canal.removed ? 'removed' : 'filled',
        state_json: JSON.stringify({ unfilled: canal.unfilled ?? false }),
        stops: canal.stops ?? 0,
        cautions: canal.cautions ?? 0,
        notes: 0,
      })),
    );
  return id;
}

/** An event row on a canal, received at `receivedAt` (the server's clock). */
export async function addEvent(
  k: Knex,
  e: { caseId: string; canalId: string; userId: number; type: string; data: Record<string, unknown> },
  at: string,
  receivedAt = at,
): Promise<string> {
  const id = randomUUID();
  const row: EventRow = {
    id,
    case_id: e.caseId,
    canal_id: e.canalId,
    type: e.type,
    at,
    data_json: JSON.stringify(e.data),
    canonical: JSON.stringify({ id, caseId: e.caseId, canalId: e.canalId, type: e.type, at, data: e.data }),
    user_id: e.userId,
    device_id: 'queue-test',
    received_at: receivedAt,
  };
  await k('events').insert(row);
  return id;
}
