/** The queue island's requests: a page of the queue, and a cone-fit sign-off (docs/review.md). */
import type {
  ErrorAnswer,
  QueueAnswer,
  QueueSort,
  QueueState,
  SignoffRequest,
  ToothGroupName,
} from '../../../lib/contract';

/** The filters as the form holds them ('' for "any"). */
export interface QueueFilters {
  state: QueueState;
  student: string;
  toothGroup: '' | ToothGroupName;
  hasStops: '' | 'true' | 'false';
  /** A chart number or its beginning: sent to the API only, never put in the page's address. */
  q: string;
  sort: QueueSort;
}

export const DEFAULT_FILTERS: Readonly<QueueFilters> = {
  state: 'needs-action',
  student: '',
  toothGroup: '',
  hasStops: '',
  q: '',
  sort: 'waiting',
};

export const sameFilters = (a: QueueFilters, b: QueueFilters): boolean =>
  (Object.keys(a) as (keyof QueueFilters)[]).every((key) => a[key] === b[key]);

/** A refused request, with the server's words and code. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly code?: string,
    readonly state?: string,
  ) {
    super(message);
  }
}

async function errorOf(res: Response): Promise<ApiError> {
  const body = (await res.json().catch(() => null)) as (ErrorAnswer & { state?: string }) | null;
  if (res.status === 401) return new ApiError(401, 'Your session has ended: sign in again.');
  return new ApiError(res.status, body?.error ?? `The server answered ${res.status}.`, body?.code, body?.state);
}

/** The query string of one page; only filters that are set go in. */
export function queueSearch(f: QueueFilters, cursor?: string): string {
  const p = new URLSearchParams();
  if (f.state !== DEFAULT_FILTERS.state) p.set('state', f.state);
  if (f.student) p.set('student', f.student);
  if (f.toothGroup) p.set('toothGroup', f.toothGroup);
  if (f.hasStops) p.set('hasStops', f.hasStops);
  if (f.q.trim()) p.set('q', f.q.trim());
  if (f.sort !== DEFAULT_FILTERS.sort) p.set('sort', f.sort);
  if (cursor) p.set('cursor', cursor);
  const text = p.toString();
  return text ? `?${text}` : '';
}

export async function fetchQueue(
  f: QueueFilters,
  cursor: string | undefined,
  signal?: AbortSignal,
): Promise<QueueAnswer> {
  const res = await fetch(`/api/review/queue${queueSearch(f, cursor)}`, {
    headers: { Accept: 'application/json' },
    credentials: 'same-origin',
    signal,
  });
  if (!res.ok) throw await errorOf(res);
  return (await res.json()) as QueueAnswer;
}

/** A request id: crypto.randomUUID where the page is a secure context, else made from random bytes. */
export function requestId(): string {
  if (typeof crypto.randomUUID === 'function') return crypto.randomUUID();
  const b = crypto.getRandomValues(new Uint8Array(16));
  b[6] = (b[6]! & 0x0f) | 0x40;
  b[8] = (b[8]! & 0x3f) | 0x80;
  const h = [...b].map((x) => x.toString(16).padStart(2, '0')).join('');
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}

/** Signs off a canal's cone fit; resolves when stored, throws an ApiError when refused. */
export async function postConeFitSignoff(caseId: string, body: SignoffRequest): Promise<void> {
  const res = await fetch(`/api/cases/${caseId}/signoffs`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Accept: 'application/json' },
    credentials: 'same-origin',
    body: JSON.stringify(body),
  });
  if (!res.ok) throw await errorOf(res);
}
