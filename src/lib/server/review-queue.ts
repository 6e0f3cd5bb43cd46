/**
 * The review queue (GET /api/review/queue and the /review page; docs/review.md, "The queue"):
 * what waits for an attending now — submitted cases and cases with a pending cone-fit item —
 * and, under their own filters, the other cases they may read. One query for a page of rows
 * and one for their cone-fit items, whatever the page holds; no query per row.
 */
import type { Knex } from 'knex';
import {
  CONEFIT_EVENT_TYPES,
  QUEUE_PAGE_SIZE,
  type ConeFitItem,
  type QueueAnswer,
  type QueueRow,
  type QueueSinceKind,
  type QueueSort,
  type ToothGroupName,
} from '../contract';
import { isValidFdi, toothGroup } from '../rules/index';
import { REMOVED, UNFILLED_SQL } from './canal-store';
import { db } from './db';
import { encodeCursor, type QueueParams } from './review-queue-query';
import type { CaseRow, EventRow, UserRow } from './tables';

/** Who may see the queue: attendings (their assigned students' cases) and directors (every case). */
export const mayUseQueue = (user: SessionUser): boolean => user.role === 'attending' || user.role === 'director';

/** Every FDI tooth of a group, from the rules core's grouping (one source for what "molar" means). */
export function teethOf(group: ToothGroupName): number[] {
  const teeth: number[] = [];
  for (let n = 11; n <= 85; n++) {
    if (!isValidFdi(n)) continue;
    const g = toothGroup(n);
    const name: ToothGroupName = g.anterior ? 'anterior' : g.kind === 'premolar' ? 'premolar' : 'molar';
    if (name === group) teeth.push(n);
  }
  return teeth;
}

/**
 * `e.type in (…)` with the types written into the SQL: SQLite uses the partial index on these
 * rows (migration 20261205000100) only when the query's terms match its WHERE clause, which a
 * bound parameter never does. The types are the contract's constants, checked to be plain words.
 */
const CONEFIT_TYPES_SQL = `e.type in (${CONEFIT_EVENT_TYPES.map((t) => {
  if (!/^[a-zA-Z.]+$/.test(t)) throw new Error(`unexpected event type ${t}`);
  return `'${t}'`;
}).join(', ')})`;

/** States in which a cone-fit item can still be acted on: a signed-off case takes no checkpoint. */
const ACTIONABLE = ['open', 'submitted', 'returned'] as const;

/** An ISO instant in one spelling (UTC, milliseconds), so that instants written with an offset sort right. */
const utc = (col: string) => `coalesce(strftime('%Y-%m-%dT%H:%M:%fZ', ${col}), ${col})`;

/** `c.student_id` limited to what `user` may read (attendings: their assigned students). */
function scopeSql(user: SessionUser): { sql: string; bindings: number[] } {
  return user.role === 'director'
    ? { sql: '1 = 1', bindings: [] }
    : { sql: 'c.student_id in (select student_id from assignments where attending_id = ?)', bindings: [user.id] };
}

/** The CTEs a query needs to read `pending`; attach them with `withPending`. */
interface PendingCtes {
  events: Knex.Raw;
  cone_fit: Knex.Raw;
  pending: Knex.Raw;
}

/**
 * The pending cone-fit items of the cases in scope, as CTEs ending in `pending`.
 * For a live canal of a case that is not signed off or discarded, its latest live (not voided)
 * `conefit.requested` or `conefit.approvedAtChair` event is pending when the server received it
 * after the canal's latest `cone-fit` sign-off (any decision), or when there is none.
 */
function pendingCtes(k: Knex, user: SessionUser, caseIds?: readonly string[]): PendingCtes {
  const scope = scopeSql(user);
  const only = caseIds ? `and e.case_id in (${caseIds.map(() => '?').join(', ')})` : '';
  // Materialised first, from the partial index alone: otherwise the planner may walk every
  // event of every case in scope to find the few cone-fit ones.
  const events = k.raw(
    `select e.id, e.case_id, e.canal_id, e.type, e.at, e.received_at, e.data_json from events e
     where ${CONEFIT_TYPES_SQL} ${only}`,
    [...(caseIds ?? [])],
  );
  // A void counts for an event of its own canal, unless a void names the void itself
  // (src/lib/rules/timeline.ts, withoutVoided).
  const coneFit = k.raw(
    `select e.*,
       row_number() over (partition by e.canal_id order by e.received_at desc, e.at desc, e.id desc) as rn
     from cone_fit_events e
     join canals ca on ca.id = e.canal_id and ca.case_id = e.case_id
     join cases c on c.id = e.case_id
     where ca.status <> ? and c.discarded_at is null
       and c.review_status in (${ACTIONABLE.map(() => '?').join(', ')}) and ${scope.sql}
       and not exists (
         select 1 from events v
         where v.canal_id = e.canal_id and v.type = 'event.voided' and json_extract(v.data_json, '$.eventId') = e.id
           and not exists (
             select 1 from events w
             where w.case_id = v.case_id and w.type = 'event.voided' and json_extract(w.data_json, '$.eventId') = v.id))`,
    [REMOVED, ...ACTIONABLE, ...scope.bindings],
  );
  const pending = k.raw(
    `select * from cone_fit f
     where f.rn = 1 and f.received_at > coalesce((
       select max(s.created_at) from signoffs s
       where s.case_id = f.case_id and s.canal_id = f.canal_id and s.checkpoint = 'cone-fit'), '')`,
  );
  return { events, cone_fit: coneFit, pending };
}

/** `q` with the CTEs that define `pending`. */
function withPending(q: Knex.QueryBuilder, ctes: PendingCtes): Knex.QueryBuilder {
  return q
    .withMaterialized('cone_fit_events', ctes.events)
    .with('cone_fit', ctes.cone_fit)
    .with('pending', ctes.pending);
}

/** The row the page query answers (columns of `cases` and `users` under the names it gives them). */
interface PageDbRow extends Pick<CaseRow, 'tooth' | 'setting' | 'chart_ref' | 'submitted_at'> {
  case_id: CaseRow['id'];
  student_id: CaseRow['student_id'];
  student_name: UserRow['name'];
  student_key: string;
  state: CaseRow['review_status'];
  tooth_key: number;
  canals: number;
  stops: number;
  cautions: number;
  unfilled: number;
  cone_first: number;
  since_at: string;
  since_kind: QueueSinceKind;
}

/** How each order compares rows: column, direction. Every order starts with rows that have a cone-fit item. */
const ORDER: Record<QueueSort, [keyof PageDbRow, 'asc' | 'desc'][]> = {
  waiting: [
    ['cone_first', 'desc'],
    ['since_at', 'asc'],
    ['case_id', 'asc'],
  ],
  student: [
    ['cone_first', 'desc'],
    ['student_key', 'asc'],
    ['student_id', 'asc'],
    ['since_at', 'asc'],
    ['case_id', 'asc'],
  ],
  tooth: [
    ['cone_first', 'desc'],
    ['tooth_key', 'asc'],
    ['since_at', 'asc'],
    ['case_id', 'asc'],
  ],
  stops: [
    ['cone_first', 'desc'],
    ['stops', 'desc'],
    ['cautions', 'desc'],
    ['since_at', 'asc'],
    ['case_id', 'asc'],
  ],
};

/** "Comes after the cursor's row" in the order's terms, as SQL: (a > x) or (a = x and (b > y …)). */
function afterSql(order: [string, 'asc' | 'desc'][], keys: (string | number)[]): { sql: string; bindings: unknown[] } {
  const [head, ...tail] = order;
  const [col, dir] = head!;
  const op = dir === 'asc' ? '>' : '<';
  if (tail.length === 0) return { sql: `q.${col} ${op} ?`, bindings: [keys[0]] };
  const rest = afterSql(tail, keys.slice(1));
  return {
    sql: `(q.${col} ${op} ? or (q.${col} = ? and ${rest.sql}))`,
    bindings: [keys[0], keys[0], ...rest.bindings],
  };
}

/** `%`, `_` and the escape itself taken literally in a LIKE pattern. */
const likeLiteral = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);

/** One page of the queue for `user` (an attending or a director; callers check first). */
export async function reviewQueue(k: Knex, user: SessionUser, params: QueueParams): Promise<QueueAnswer> {
  const scope = scopeSql(user);
  const ctes = pendingCtes(k, user);
  const base = k('cases as c')
    .join('users as u', 'u.id', 'c.student_id')
    .leftJoin(
      k.raw(`(select case_id, count(*) as n, min(${utc('at')}) as first_at from pending group by case_id) as p`),
      'p.case_id',
      'c.id',
    )
    .whereNull('c.discarded_at')
    .whereRaw(scope.sql, scope.bindings)
    .select(
      'c.id as case_id',
      'c.student_id',
      'u.name as student_name',
      k.raw('lower(u.name) as student_key'),
      'c.tooth',
      k.raw('coalesce(c.tooth, 1000) as tooth_key'),
      'c.setting',
      'c.chart_ref',
      'c.review_status as state',
      'c.submitted_at',
      'c.signed_off_at',
      k.raw(`${utc('c.opened_at')} as opened_at`),
      k.raw(`(select count(*) from canals where case_id = c.id and status <> ?) as canals`, [REMOVED]),
      k.raw(`coalesce((select sum(stops) from canals where case_id = c.id and status <> ?), 0) as stops`, [REMOVED]),
      k.raw(`coalesce((select sum(cautions) from canals where case_id = c.id and status <> ?), 0) as cautions`, [
        REMOVED,
      ]),
      k.raw(`(select count(*) from canals where case_id = c.id and status <> ? and ${UNFILLED_SQL} = 1) as unfilled`, [
        REMOVED,
      ]),
      k.raw(
        `(select max(created_at) from signoffs where case_id = c.id and checkpoint = 'final' and decision = 'returned') as returned_at`,
      ),
      k.raw('case when p.n > 0 then 1 else 0 end as cone_first'),
      'p.first_at as cone_fit_at',
    );
  if (params.state === 'needs-action')
    base.where((w) => w.where('c.review_status', 'submitted').orWhere((o) => o.whereNotNull('p.n')));
  else if (params.state !== 'all') base.where('c.review_status', params.state);
  if (params.student !== undefined) base.where('c.student_id', params.student);
  if (params.toothGroup) base.whereIn('c.tooth', teethOf(params.toothGroup));
  if (params.q) base.whereRaw("c.chart_ref like ? escape '\\'", [`${likeLiteral(params.q)}%`]);

  // Since when each row waits (docs/review.md): the submission or the oldest pending cone-fit
  // item, whichever came first; rows that do not wait show when they were returned, signed off or opened.
  const timed = k
    .queryBuilder()
    .from(base.as('b'))
    .select(
      'b.*',
      k.raw(`case
        when b.cone_fit_at is not null and (b.state <> 'submitted' or b.submitted_at is null or b.cone_fit_at < b.submitted_at) then b.cone_fit_at
        when b.state = 'submitted' then coalesce(b.submitted_at, b.opened_at)
        when b.state = 'returned' then coalesce(b.returned_at, b.submitted_at, b.opened_at)
        when b.state = 'approved' then coalesce(b.signed_off_at, b.opened_at)
        else b.opened_at end as since_at`),
      k.raw(`case
        when b.cone_fit_at is not null and (b.state <> 'submitted' or b.submitted_at is null or b.cone_fit_at < b.submitted_at) then 'cone-fit'
        when b.state = 'submitted' then 'submitted'
        when b.state = 'returned' then 'returned'
        when b.state = 'approved' then 'approved'
        else 'opened' end as since_kind`),
    );

  const order = ORDER[params.sort];
  const page = withPending(k.queryBuilder(), ctes).from(timed.as('q')).select('q.*');
  if (params.hasStops !== undefined) page.where('q.stops', params.hasStops ? '>' : '=', 0);
  if (params.cursor) {
    const after = afterSql(order, params.cursor.keys);
    page.whereRaw(after.sql, after.bindings as Knex.Value[]);
  }
  for (const [col, dir] of order) page.orderBy(`q.${col}`, dir);
  page.limit(QUEUE_PAGE_SIZE + 1);
  const rows = (await page) as PageDbRow[];

  const more = rows.length > QUEUE_PAGE_SIZE;
  const shown = rows.slice(0, QUEUE_PAGE_SIZE);
  const items = await coneFitItems(
    k,
    user,
    shown.filter((r) => r.cone_first === 1).map((r) => r.case_id),
  );
  const last = shown.at(-1);
  return {
    rows: shown.map((r) => toQueueRow(r, items.get(r.case_id) ?? [])),
    nextCursor:
      more && last
        ? encodeCursor({ sort: params.sort, keys: order.map(([col]) => last[col] as string | number) })
        : null,
  };
}

function toQueueRow(r: PageDbRow, coneFits: ConeFitItem[]): QueueRow {
  return {
    caseId: r.case_id,
    student: { id: r.student_id, name: r.student_name },
    tooth: r.tooth,
    setting: r.setting,
    chartRef: r.chart_ref,
    state: r.state,
    canals: Number(r.canals),
    since: { at: r.since_at, kind: r.since_kind },
    submittedAt: r.submitted_at,
    stops: Number(r.stops),
    cautions: Number(r.cautions),
    unfilled: Number(r.unfilled),
    coneFits,
  };
}

interface ItemDbRow extends Pick<EventRow, 'case_id' | 'canal_id' | 'type' | 'at' | 'data_json'> {
  event_id: EventRow['id'];
  canal_name: string;
  attending_name: UserRow['name'] | null;
}

/** The pending cone-fit items of the cases, by case id, oldest first. One query for them all. */
export async function coneFitItems(
  k: Knex,
  user: SessionUser,
  caseIds: readonly string[],
): Promise<Map<string, ConeFitItem[]>> {
  const out = new Map<string, ConeFitItem[]>();
  if (caseIds.length === 0) return out;
  const ctes = pendingCtes(k, user, caseIds);
  const rows = (await withPending(k.queryBuilder(), ctes)
    .from('pending as p')
    .join('canals as ca', 'ca.id', 'p.canal_id')
    // The named attending, when the id is a known attending or director (the tablet sends it as text).
    .leftJoin('users as a', (j) =>
      j
        .on('a.id', '=', k.raw("cast(json_extract(p.data_json, '$.attendingId') as integer)"))
        .andOn(k.raw("cast(a.id as text) = json_extract(p.data_json, '$.attendingId')"))
        .andOnIn('a.role', ['attending', 'director']),
    )
    .select(
      'p.case_id',
      'p.canal_id',
      'p.type',
      'p.at',
      'p.data_json',
      'p.id as event_id',
      'ca.name as canal_name',
      'a.name as attending_name',
    )
    .orderByRaw(`p.case_id, ${utc('p.at')}, p.id`)) as ItemDbRow[];
  for (const r of rows) {
    const item: ConeFitItem = {
      canalId: r.canal_id!,
      canalName: r.canal_name,
      kind: r.type === 'conefit.approvedAtChair' ? 'at-chair' : 'requested',
      eventId: r.event_id,
      recordedAt: r.at,
    };
    if (item.kind === 'at-chair') {
      item.attendingId = attendingIdOf(r.data_json);
      item.attendingName = r.attending_name;
    }
    const list = out.get(r.case_id) ?? [];
    list.push(item);
    out.set(r.case_id, list);
  }
  return out;
}

function attendingIdOf(json: string): string {
  try {
    const v = (JSON.parse(json) as { attendingId?: unknown }).attendingId;
    return typeof v === 'string' ? v : v === undefined || v === null ? '' : String(v);
  } catch {
    return '';
  }
}

/** The students whose cases `user` sees in the queue, for its student filter: id and name, by name. */
export async function queueStudents(k: Knex, user: SessionUser): Promise<{ id: number; name: string }[]> {
  const q = k('users').where('users.role', 'student').select('users.id', 'users.name').orderBy('users.name');
  if (user.role !== 'director')
    q.whereIn('users.id', k('assignments').select('student_id').where('attending_id', user.id));
  return q;
}

/** The /review page's data: the first page with the default filters, and the student filter's names. */
export async function queuePage(
  user: SessionUser,
): Promise<{ initial: QueueAnswer; students: { id: number; name: string }[] }> {
  const k = await db();
  return {
    initial: await reviewQueue(k, user, { state: 'needs-action', sort: 'waiting' }),
    students: await queueStudents(k, user),
  };
}
