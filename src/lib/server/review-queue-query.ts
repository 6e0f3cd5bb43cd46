/**
 * The query of GET /api/review/queue read into a typed value, and the queue's opaque cursor
 * (docs/review.md, "The queue"). A bad parameter is answered 400 naming it.
 */
import { z } from 'zod';
import { QUEUE_SORTS, QUEUE_STATES, TOOTH_GROUPS, type QueueSort, type QueueState } from '../contract';
import { formatZodError } from '../rules/index';
import type { ToothGroupName } from '../contract';

/** What the queue service is asked for; every field has its default filled in. */
export interface QueueParams {
  state: QueueState;
  student?: number;
  toothGroup?: ToothGroupName;
  hasStops?: boolean;
  q?: string;
  sort: QueueSort;
  cursor?: QueueCursor;
}

/** Where a page ended: the sort keys of its last row, in the order the sort compares them. */
export interface QueueCursor {
  sort: QueueSort;
  keys: (string | number)[];
}

/** The longest chart number `cases.chart_ref` holds. */
const CHART_MAX = 64;

const schema = z
  .object({
    state: z.enum(QUEUE_STATES).default('needs-action'),
    student: z
      .string()
      .regex(/^[1-9]\d{0,9}$/, "student must be a student's id (a whole number from 1)")
      .transform(Number)
      .optional(),
    toothGroup: z.enum(TOOTH_GROUPS).optional(),
    hasStops: z
      .enum(['true', 'false'], { errorMap: () => ({ message: 'hasStops must be true or false' }) })
      .transform((v) => v === 'true')
      .optional(),
    q: z
      .string()
      .trim()
      .max(CHART_MAX, `q (a chart number or its beginning) may be at most ${CHART_MAX} characters`)
      .transform((v) => (v === '' ? undefined : v))
      .optional(),
    sort: z.enum(QUEUE_SORTS).default('waiting'),
    cursor: z.string().max(1000, 'cursor is not one this queue gave out').optional(),
  })
  .strict();

const NAMES = Object.keys(schema.shape);

/** The number of sort keys each order keeps in its cursor, and whether each is a number. */
const KEY_KINDS: Record<QueueSort, ('s' | 'n')[]> = {
  // Every order starts with "has a pending cone-fit item" (1 first), and ends with the case id.
  waiting: ['n', 's', 's'],
  student: ['n', 's', 'n', 's', 's'],
  tooth: ['n', 'n', 's', 's'],
  stops: ['n', 'n', 'n', 's', 's'],
};

/** The cursor a client sends back, as the last row's keys: base64url JSON, opaque to clients. */
export function encodeCursor(c: QueueCursor): string {
  return Buffer.from(JSON.stringify({ s: c.sort, k: c.keys })).toString('base64url');
}

/** The cursor, or null when it is not one this queue gave out for `sort`. */
export function decodeCursor(text: string, sort: QueueSort): QueueCursor | null {
  let v: unknown;
  try {
    v = JSON.parse(Buffer.from(text, 'base64url').toString('utf8'));
  } catch {
    return null;
  }
  if (!v || typeof v !== 'object') return null;
  const { s, k } = v as { s?: unknown; k?: unknown };
  const kinds = KEY_KINDS[sort];
  if (s !== sort || !Array.isArray(k) || k.length !== kinds.length) return null;
  const ok = k.every((key, i) =>
    kinds[i] === 'n' ? typeof key === 'number' && Number.isFinite(key) : typeof key === 'string' && key.length <= 300,
  );
  return ok ? { sort, keys: k as (string | number)[] } : null;
}

export type ParsedQuery = { ok: true; value: QueueParams } | { ok: false; field: string; error: string };

/** The query string read, or the first problem in plain words with the parameter it is about. */
export function parseQueueQuery(params: URLSearchParams): ParsedQuery {
  const raw: Record<string, string> = {};
  for (const [name, value] of params) {
    if (!NAMES.includes(name))
      return {
        ok: false,
        field: name,
        error: `${name} is not a parameter of the queue; it takes ${NAMES.join(', ')}`,
      };
    if (name in raw) return { ok: false, field: name, error: `${name} is given more than once` };
    raw[name] = value;
  }
  const read = schema.safeParse(raw);
  if (!read.success) {
    const field = String(read.error.issues[0]?.path[0] ?? 'query');
    return { ok: false, field, error: formatZodError(read.error) };
  }
  const { cursor: cursorText, ...rest } = read.data;
  let cursor: QueueCursor | undefined;
  if (cursorText !== undefined) {
    const decoded = decodeCursor(cursorText, rest.sort);
    if (!decoded)
      return {
        ok: false,
        field: 'cursor',
        error: 'cursor is not one this queue gave out for this order; start again from the first page',
      };
    cursor = decoded;
  }
  const value: QueueParams = { state: rest.state, sort: rest.sort };
  if (rest.student !== undefined) value.student = rest.student;
  if (rest.toothGroup !== undefined) value.toothGroup = rest.toothGroup;
  if (rest.hasStops !== undefined) value.hasStops = rest.hasStops;
  if (rest.q !== undefined) value.q = rest.q;
  if (cursor) value.cursor = cursor;
  return { ok: true, value };
}
