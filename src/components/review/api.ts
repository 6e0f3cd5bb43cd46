/**
 * The review page's writes (docs/review.md): a comment, a sign-off, a reopening. Each is sent
 * with an id made here, so sending the same request again after no answer can never store it
 * twice: the server answers the first answer. The tablet's own fetchers are in src/lib/client.
 */
import { v4 as uuidv4 } from 'uuid';
import type { CommentAnswer, CommentRequest, ReopenRequest, SignoffAnswer, SignoffRequest } from '../../lib/contract';

/** A fresh request id; the uuid package where `crypto.randomUUID` is missing (outside HTTPS or localhost). */
export function requestId(): string {
  const c = (globalThis as { crypto?: Crypto }).crypto;
  return c && typeof c.randomUUID === 'function' ? c.randomUUID() : uuidv4();
}

/** What came back: the answer, a refusal with the server's words, or no answer at all. */
export type Sent<T> =
  | { kind: 'ok'; value: T }
  /** A definite answer: sending the same request again gets the same one. */
  | { kind: 'refused'; status: number; error: string; code?: string; field?: string; state?: string }
  /** No answer, a server fault or a lost sign-in: the same request may be sent again. */
  | { kind: 'unsent'; error: string };

const NO_ANSWER = 'No answer from the server (the network or the server is down).';

async function post<T>(path: string, body: unknown): Promise<Sent<T>> {
  let res: Response;
  try {
    res = await fetch(path, {
      method: 'POST',
      credentials: 'same-origin',
      cache: 'no-store',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify(body),
    });
  } catch {
    return { kind: 'unsent', error: NO_ANSWER };
  }
  let json: Record<string, unknown> = {};
  try {
    json = (await res.json()) as Record<string, unknown>;
  } catch {
    /* no JSON body */
  }
  if (res.status === 201 || res.status === 200) return { kind: 'ok', value: json as T };
  const error = typeof json.error === 'string' ? json.error : `The server answered ${res.status}.`;
  if (res.status === 401) return { kind: 'unsent', error: 'You are signed out: sign in again, then send it again.' };
  if (res.status >= 500 || res.status === 429)
    return { kind: 'unsent', error: `The server could not take it just now (${res.status}): ${error}` };
  const str = (k: string) => (typeof json[k] === 'string' ? { [k]: json[k] as string } : {});
  return { kind: 'refused', status: res.status, error, ...str('code'), ...str('field'), ...str('state') };
}

export function postComment(caseId: string, body: CommentRequest): Promise<Sent<CommentAnswer>> {
  return post(`/api/cases/${encodeURIComponent(caseId)}/comments`, body);
}

export function postSignoff(caseId: string, body: SignoffRequest): Promise<Sent<SignoffAnswer>> {
  return post(`/api/cases/${encodeURIComponent(caseId)}/signoffs`, body);
}

export function postReopen(caseId: string, body: ReopenRequest): Promise<Sent<SignoffAnswer>> {
  return post(`/api/cases/${encodeURIComponent(caseId)}/reopen`, body);
}
