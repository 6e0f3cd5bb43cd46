/**
 * The case list's query (GET /api/cases and the /cases page's GET form), declared once as a
 * zod schema of the query string. Kept apart from contract.ts, which must stay free of zod
 * (the chairside's budget); contract.ts re-exports the types. docs/sync-contract.md
 * ("GET /api/cases") is the written form.
 */
import { z } from 'zod';
import { TOOTH_GROUPS, type CaseSummary } from './contract';

// The tooth groups are the contract's (the review queue filters by the same ones).
export { TOOTH_GROUPS };

/** The case states the list filters by (discarded cases are in no list). */
export const CASE_LIST_STATES = ['open', 'submitted', 'returned', 'approved'] as const;
export type CaseListState = (typeof CASE_LIST_STATES)[number];

/** The most cases one page holds, and how many when `limit` is not given but paging is. */
export const CASE_PAGE_MAX = 200;
export const CASE_PAGE_DEFAULT = 50;

const DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

function realDate(s: string): boolean {
  const m = DATE.exec(s);
  if (!m) return false;
  const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
  return d.toISOString().slice(0, 10) === s;
}

const once = (name: string) => z.string({ invalid_type_error: `${name} may be given only once` });

const day = (name: string) =>
  once(name).refine(realDate, `${name} must be a date written YYYY-MM-DD, e.g. 2026-11-30`).optional();

const id = (name: string) =>
  once(name)
    .regex(/^[1-9]\d{0,9}$/, `${name} must be the id of a ${name}`)
    .transform(Number)
    .optional();

/** The query, as strings from the URL; empty values (a GET form's unset fields) count as absent. */
const caseListQueryObject = z
  .object({
    cohort: id('cohort'),
    student: id('student'),
    attending: id('attending'),
    state: z
      .enum(CASE_LIST_STATES, {
        errorMap: () => ({ message: `state must be one of ${CASE_LIST_STATES.join(', ')}` }),
      })
      .optional(),
    toothGroup: z
      .enum(TOOTH_GROUPS, { errorMap: () => ({ message: `toothGroup must be one of ${TOOTH_GROUPS.join(', ')}` }) })
      .optional(),
    openedFrom: day('openedFrom'),
    openedTo: day('openedTo'),
    submittedFrom: day('submittedFrom'),
    submittedTo: day('submittedTo'),
    cursor: once('cursor').max(200, 'cursor is not one this list gave').optional(),
    limit: once('limit')
      .regex(/^\d{1,4}$/, `limit must be a number from 1 to ${CASE_PAGE_MAX}`)
      .transform(Number)
      .refine((n) => n >= 1 && n <= CASE_PAGE_MAX, `limit must be a number from 1 to ${CASE_PAGE_MAX}`)
      .optional(),
  })
  .strict();

/** The parameters the case list reads. */
export const CASE_LIST_PARAMS = Object.keys(caseListQueryObject.shape) as (keyof typeof caseListQueryObject.shape)[];

export const caseListQuerySchema = caseListQueryObject.superRefine((q, ctx) => {
  for (const [from, to] of [
    ['openedFrom', 'openedTo'],
    ['submittedFrom', 'submittedTo'],
  ] as const) {
    const a = q[from];
    const b = q[to];
    if (a && b && a > b) ctx.addIssue({ code: 'custom', path: [to], message: `${to} must not be before ${from}` });
  }
});
export type CaseListQuery = z.infer<typeof caseListQuerySchema>;

/** The query string's parameters as the schema reads them: empty values dropped, a repeated one refused. */
export function queryObject(params: URLSearchParams): Record<string, string | string[]> {
  const out: Record<string, string | string[]> = {};
  for (const [key, value] of params) {
    if (value.trim() === '') continue;
    const prior = out[key];
    out[key] = prior === undefined ? value.trim() : ([] as string[]).concat(prior, value.trim());
  }
  return out;
}

/** GET /api/cases. */
export interface CaseListAnswer {
  cases: CaseSummary[];
  /** Where the next page starts (pass it as `cursor`); null on the last page or without paging. */
  nextCursor: string | null;
}
