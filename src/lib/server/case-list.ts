/**
 * The case list (GET /api/cases with a query, and the /cases page): every case the user may
 * read — all of them for a director, their assigned students' for an attending — filtered by
 * cohort, student, attending, state, tooth group and the day it was opened or submitted in the
 * clinic's time zone, newest first, a page at a time. docs/sync-contract.md ("GET /api/cases").
 */
import type { Knex } from 'knex';
import type { CaseListAnswer, CaseListQuery, ToothGroupName } from '../contract';
import {
  CASE_LIST_PARAMS,
  CASE_PAGE_DEFAULT,
  caseListQuerySchema,
  queryObject,
  TOOTH_GROUPS,
} from '../contract-case-list';
import { formatZodError } from '../rules/index';
import { fieldOf } from './api-body';
import { listCases } from './cases';
import { teethOf } from './review-queue';
import { config } from './config';
import { db } from './db';
import { dayStartIn } from '../present/zone';

/** Every FDI number of each tooth group, for the query (the review queue's grouping, from the rules core). */
const TEETH_BY_GROUP: Readonly<Record<ToothGroupName, number[]>> = Object.fromEntries(
  TOOTH_GROUPS.map((g) => [g, teethOf(g)]),
) as Record<ToothGroupName, number[]>;

/** The instant a clinic day (YYYY-MM-DD) begins in `timeZone`, `days` later, as an ISO string. */
export const dayStart = (date: string, timeZone: string, days = 0): string => dayStartIn(date, timeZone, days);

/** Stored instants are kept as written (Z or an offset): compared in one UTC form. */
const utc = (column: string) => `coalesce(strftime('%Y-%m-%dT%H:%M:%fZ', ${column}), ${column})`;

interface Cursor {
  openedAt: string;
  caseId: string;
}

function encodeCursor(c: Cursor): string {
  return Buffer.from(JSON.stringify([c.openedAt, c.caseId])).toString('base64url');
}

function decodeCursor(s: string): Cursor | null {
  try {
    const v: unknown = JSON.parse(Buffer.from(s, 'base64url').toString('utf8'));
    if (Array.isArray(v) && v.length === 2 && typeof v[0] === 'string' && typeof v[1] === 'string')
      return { openedAt: v[0], caseId: v[1] };
  } catch {
    // not one of ours
  }
  return null;
}

export type CaseListResult = { ok: true; answer: CaseListAnswer } | { ok: false; error: string; field: string };

/**
 * The cases `user` may read that pass the query. Paged when `paged` (the page always, the API
 * when the query names a `limit` or a `cursor`): at most `limit` cases and the cursor of the
 * next page; otherwise every matching case, as GET /api/cases has always answered.
 */
export async function findCases(
  k: Knex,
  user: SessionUser,
  query: CaseListQuery,
  opts: { timeZone: string; paged: boolean },
): Promise<CaseListResult> {
  const after = query.cursor === undefined ? null : decodeCursor(query.cursor);
  if (query.cursor !== undefined && !after)
    return { ok: false, error: 'cursor is not one this list gave; start again from the first page', field: 'cursor' };
  const limit = opts.paged ? (query.limit ?? CASE_PAGE_DEFAULT) : null;
  const zone = opts.timeZone;
  const cases = await listCases(k, user, {
    refine: (q) => {
      if (query.student !== undefined) q.where('cases.student_id', query.student);
      if (query.cohort !== undefined)
        q.whereIn('cases.student_id', k('users').select('id').where('cohort_id', query.cohort));
      if (query.attending !== undefined)
        q.whereIn('cases.student_id', k('assignments').select('student_id').where('attending_id', query.attending));
      if (query.state !== undefined) q.where('cases.review_status', query.state);
      if (query.toothGroup !== undefined) q.whereIn('cases.tooth', TEETH_BY_GROUP[query.toothGroup]);
      if (query.openedFrom) q.whereRaw(`${utc('cases.opened_at')} >= ?`, [dayStart(query.openedFrom, zone)]);
      if (query.openedTo) q.whereRaw(`${utc('cases.opened_at')} < ?`, [dayStart(query.openedTo, zone, 1)]);
      if (query.submittedFrom) q.whereRaw(`${utc('cases.submitted_at')} >= ?`, [dayStart(query.submittedFrom, zone)]);
      if (query.submittedTo) q.whereRaw(`${utc('cases.submitted_at')} < ?`, [dayStart(query.submittedTo, zone, 1)]);
      if (after)
        q.where((w) =>
          w
            .where('cases.opened_at', '<', after.openedAt)
            .orWhere((x) => x.where('cases.opened_at', after.openedAt).where('cases.id', '<', after.caseId)),
        );
      // Opened at the same instant: the id decides, so a page boundary never splits or repeats.
      q.orderBy('cases.id', 'desc');
      if (limit !== null) q.limit(limit + 1);
    },
  });
  const more = limit !== null && cases.length > limit;
  const page = more ? cases.slice(0, limit) : cases;
  const last = page.at(-1);
  return {
    ok: true,
    answer: {
      cases: page,
      nextCursor: more && last ? encodeCursor({ openedAt: last.openedAt, caseId: last.caseId }) : null,
    },
  };
}

export interface CaseListOptions {
  cohorts: { cohortId: number; name: string; archived: boolean }[];
  students: { userId: number; name: string }[];
  /** Directors only: an attending's list is already theirs. */
  attendings: { userId: number; name: string; active: boolean }[];
}

/** What the case list's pickers offer `user`: a director everything, an attending their students'. */
export async function caseListOptions(k: Knex, user: SessionUser): Promise<CaseListOptions> {
  const director = user.role === 'director';
  const mine = k('assignments').select('student_id').where('attending_id', user.id);
  const studentsQ = k('users').select('id', 'name').orderByRaw('lower(name), id');
  // Former students keep their cases: a director finds them by anyone who owns a case too.
  if (director) studentsQ.where((w) => w.where('role', 'student').orWhereIn('id', k('cases').distinct('student_id')));
  else studentsQ.whereIn('id', mine);
  const cohortsQ = k('cohorts').select('id', 'name', 'archived_at').orderByRaw('archived_at is not null, lower(name)');
  if (!director) cohortsQ.whereIn('id', k('users').select('cohort_id').whereIn('id', mine).whereNotNull('cohort_id'));
  const attendings = director
    ? await k('users').where('role', 'attending').select('id', 'name', 'active').orderByRaw('lower(name), id')
    : [];
  return {
    cohorts: (await cohortsQ).map((c) => ({ cohortId: c.id, name: c.name, archived: c.archived_at !== null })),
    students: (await studentsQ).map((s) => ({ userId: s.id, name: s.name })),
    attendings: attendings.map((a) => ({ userId: a.id, name: a.name, active: Boolean(a.active) })),
  };
}

export interface CaseListPage {
  /** The filters as sent, to fill the form again. */
  values: Record<string, string>;
  /** A filter that does not read: its message and field; the list is then not shown. */
  problem: { message: string; field: string } | null;
  answer: CaseListAnswer | null;
  options: CaseListOptions;
}

/** The /cases page's data: the filters of its GET form read by the API's own schema. */
export async function caseListPage(user: SessionUser, params: URLSearchParams): Promise<CaseListPage> {
  const k = await db();
  const options = await caseListOptions(k, user);
  // The page reads its own form's fields and leaves any other parameter alone.
  const raw = Object.fromEntries(
    Object.entries(queryObject(params)).filter(([key]) => (CASE_LIST_PARAMS as string[]).includes(key)),
  );
  const values = Object.fromEntries(Object.entries(raw).map(([key, v]) => [key, Array.isArray(v) ? v[0]! : v]));
  const parsed = caseListQuerySchema.safeParse(raw);
  if (!parsed.success)
    return {
      values,
      options,
      answer: null,
      problem: { message: formatZodError(parsed.error), field: fieldOf(parsed.error) ?? '' },
    };
  const found = await findCases(k, user, parsed.data, { timeZone: config().clinic.timeZone, paged: true });
  if (!found.ok) return { values, options, answer: null, problem: { message: found.error, field: found.field } };
  return { values, options, answer: found.answer, problem: null };
}
