/**
 * Reading the audit log for a director (docs/settings.md, "The audit log"): filtered by
 * actor, action, subject and a range of days in the clinic's zone, newest first, a page at a
 * time behind a cursor (the last line's id), and the same lines as CSV. Only what the lines
 * store is shown, with the actor's name and a user subject's name from the accounts.
 */
import { Readable } from 'node:stream';
import { stringify } from 'csv-stringify';
import type { Knex } from 'knex';
import { z } from 'zod';
import { auditActionWords, auditDetailText } from '../present/audit';
import { formatInstant, type Clinic } from '../present/format';
import { dayStartIn, isDay } from '../present/zone';
import { formatZodError } from '../rules/index';
import { config } from './config';
import { db } from './db';
import type { AuditRow } from './tables';

export const AUDIT_PAGE = 50;
export const AUDIT_PAGE_MAX = 200;

const day = (name: string) =>
  z
    .string()
    .trim()
    .refine(isDay, `${name} must be a day written YYYY-MM-DD`)
    .optional()
    .or(z.literal('').transform(() => undefined));
const text = (name: string, max: number) =>
  z
    .string()
    .trim()
    .max(max, `${name} may be at most ${max} characters`)
    .transform((v) => (v === '' ? undefined : v))
    .optional();
const positive = (name: string, max?: number) =>
  z
    .string()
    .trim()
    .transform((v, ctx) => {
      if (v === '') return undefined;
      const n = Number(v);
      if (!/^\d{1,12}$/.test(v) || n < 1 || (max !== undefined && n > max)) {
        ctx.addIssue({
          code: z.ZodIssueCode.custom,
          message: `${name} must be a whole number from 1${max === undefined ? '' : ` to ${max}`}`,
        });
        return z.NEVER;
      }
      return n;
    })
    .optional();

/** The filters, as the page's GET form and the API's query string carry them (all optional). */
export const auditQuerySchema = z
  .object({
    actor: positive('actor'),
    action: text('action', 60),
    subjectType: text('subjectType', 40),
    subjectId: text('subjectId', 60),
    from: day('from'),
    to: day('to'),
    cursor: positive('cursor'),
    limit: positive('limit', AUDIT_PAGE_MAX),
  })
  .strict()
  .refine((q) => !q.from || !q.to || q.from <= q.to, { message: 'from must not come after to', path: ['from'] });

export type AuditQuery = z.infer<typeof auditQuerySchema>;

export type ParsedQuery = { ok: true; query: AuditQuery } | { ok: false; error: string; field?: string };

/** The filters of a query string; a bad one is refused naming its field. */
export function parseAuditQuery(params: URLSearchParams): ParsedQuery {
  const raw: Record<string, string> = {};
  for (const [k, v] of params) raw[k] = v;
  const parsed = auditQuerySchema.safeParse(raw);
  if (parsed.success) return { ok: true, query: parsed.data };
  const issue = parsed.error.issues[0];
  const field =
    issue?.code === z.ZodIssueCode.unrecognized_keys
      ? issue.keys[0]
      : typeof issue?.path[0] === 'string'
        ? issue.path[0]
        : undefined;
  return { ok: false, error: formatZodError(parsed.error), ...(field ? { field } : {}) };
}

/** One line of the audit log as the page, the API and the CSV show it. */
export interface AuditEntry {
  id: number;
  /** ISO 8601, UTC. */
  at: string;
  actorId: number | null;
  /** The actor's name from the accounts; null for the system (a script, the demo). */
  actorName: string | null;
  action: string;
  actionWords: string;
  subjectType: string | null;
  subjectId: string | null;
  /** A user subject's name from the accounts; null for other subjects. */
  subjectName: string | null;
  detail: Record<string, unknown> | null;
  detailText: string;
}

export interface AuditPage {
  entries: AuditEntry[];
  /** Pass as `cursor` for the next (older) page; null on the last page. */
  nextCursor: number | null;
}

type Joined = AuditRow & { actor_name: string | null; subject_name: string | null };

function filtered(k: Knex, q: AuditQuery, clinic: Clinic): Knex.QueryBuilder {
  const b = k('audit_log as a')
    .leftJoin('users as actor', 'actor.id', 'a.actor_id')
    .joinRaw("left join users as subject on a.subject_type = 'user' and cast(subject.id as text) = a.subject_id")
    .select('a.*', 'actor.name as actor_name', 'subject.name as subject_name');
  if (q.actor !== undefined) b.where('a.actor_id', q.actor);
  if (q.action !== undefined) b.where('a.action', q.action);
  if (q.subjectType !== undefined) b.where('a.subject_type', q.subjectType);
  if (q.subjectId !== undefined) b.where('a.subject_id', q.subjectId);
  if (q.from !== undefined) b.where('a.at', '>=', dayStartIn(q.from, clinic.timeZone));
  if (q.to !== undefined) b.where('a.at', '<', dayStartIn(q.to, clinic.timeZone, 1));
  return b;
}

function parseDetail(json: string | null): Record<string, unknown> | null {
  if (json === null) return null;
  try {
    const v = JSON.parse(json) as unknown;
    return v && typeof v === 'object' && !Array.isArray(v) ? (v as Record<string, unknown>) : { value: v };
  } catch {
    return { value: json };
  }
}

function toEntry(r: Joined): AuditEntry {
  const detail = parseDetail(r.detail_json);
  return {
    id: r.id,
    at: r.at,
    actorId: r.actor_id,
    actorName: r.actor_name,
    action: r.action,
    actionWords: auditActionWords(r.action),
    subjectType: r.subject_type,
    subjectId: r.subject_id,
    subjectName: r.subject_type === 'user' ? r.subject_name : null,
    detail,
    detailText: auditDetailText(r.action, detail),
  };
}

/** One page of the lines that match `q`, newest first, older than `q.cursor` when given. */
export async function auditPage(k: Knex, q: AuditQuery, clinic: Clinic): Promise<AuditPage> {
  const limit = q.limit ?? AUDIT_PAGE;
  const b = filtered(k, q, clinic)
    .orderBy('a.id', 'desc')
    .limit(limit + 1);
  if (q.cursor !== undefined) b.where('a.id', '<', q.cursor);
  const rows = (await b) as Joined[];
  const entries = rows.slice(0, limit).map(toEntry);
  return { entries, nextCursor: rows.length > limit ? entries.at(-1)!.id : null };
}

/** The choices of the page's filters: everyone who acted, every action and subject type recorded. */
export async function auditChoices(
  k: Knex,
): Promise<{ actors: { id: number; name: string }[]; actions: string[]; subjectTypes: string[] }> {
  const actors = (await k('users')
    .whereIn('id', k('audit_log').distinct('actor_id').whereNotNull('actor_id'))
    .orderBy('name')
    .select('id', 'name')) as { id: number; name: string }[];
  const actions = (await k('audit_log').distinct('action').orderBy('action').pluck('action')) as string[];
  const subjectTypes = (await k('audit_log')
    .distinct('subject_type')
    .whereNotNull('subject_type')
    .orderBy('subject_type')
    .pluck('subject_type')) as string[];
  return { actors, actions, subjectTypes };
}

/**
 * A cell that a spreadsheet would read as a formula (it begins with =, +, -, @, a tab or a
 * carriage return) gets a leading apostrophe, so it is shown as the text it is.
 */
export function neutraliseCell(value: string): string {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

export const AUDIT_CSV_COLUMNS = [
  'id',
  'at_utc',
  'at_clinic',
  'actor_id',
  'actor',
  'action',
  'action_words',
  'subject_type',
  'subject_id',
  'subject_name',
  'detail',
] as const;

/** The lines of `q` (all pages, newest first) as CSV, read 500 at a time while it is sent. */
export function auditCsv(k: Knex, q: AuditQuery, clinic: Clinic): ReadableStream<Uint8Array> {
  const csv = stringify({
    header: true,
    columns: [...AUDIT_CSV_COLUMNS],
    cast: { string: neutraliseCell },
  });
  async function* lines() {
    let cursor = q.cursor;
    for (;;) {
      const page = await auditPage(k, { ...q, cursor, limit: AUDIT_PAGE_MAX }, clinic);
      for (const e of page.entries)
        yield {
          id: e.id,
          at_utc: e.at,
          at_clinic: formatInstant(e.at, clinic),
          actor_id: e.actorId ?? '',
          actor: e.actorName ?? (e.actorId === null ? 'system' : ''),
          action: e.action,
          action_words: e.actionWords,
          subject_type: e.subjectType ?? '',
          subject_id: e.subjectId ?? '',
          subject_name: e.subjectName ?? '',
          detail: e.detail === null ? '' : JSON.stringify(e.detail),
        };
      if (page.nextCursor === null) return;
      cursor = page.nextCursor;
    }
  }
  const source = Readable.from(lines());
  // A fault while reading ends the download with an error rather than a file cut short silently.
  source.on('error', (err) => csv.destroy(err));
  source.pipe(csv);
  return Readable.toWeb(csv) as ReadableStream<Uint8Array>;
}

/** A file name safe in Content-Disposition: letters, digits and dashes only. */
export function auditCsvName(now: Date, clinic: Clinic): string {
  const day = new Intl.DateTimeFormat('en-CA', { timeZone: clinic.timeZone }).format(now).replace(/[^0-9-]/g, '');
  return `coneline-audit-${day}.csv`;
}

/** What /admin/audit shows for a query string: the page of lines, the filters' choices, or the refusal of a bad filter. */
export async function auditLogView(params: URLSearchParams): Promise<{
  clinic: Clinic;
  query: AuditQuery;
  error: { message: string; field?: string } | null;
  page: AuditPage;
  choices: Awaited<ReturnType<typeof auditChoices>>;
}> {
  const k = await db();
  const clinic = config().clinic;
  const parsed = parseAuditQuery(params);
  const choices = await auditChoices(k);
  if (!parsed.ok)
    return {
      clinic,
      query: {},
      error: { message: parsed.error, ...(parsed.field ? { field: parsed.field } : {}) },
      page: { entries: [], nextCursor: null },
      choices,
    };
  return { clinic, query: parsed.query, error: null, page: await auditPage(k, parsed.query, clinic), choices };
}
