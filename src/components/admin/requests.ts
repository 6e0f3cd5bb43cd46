// The settings page's requests: JSON in and out, each write with a new client-made id.
import { v4 as uuidv4 } from 'uuid';

/** A new request id (UUID); the uuid package where the page is not a secure context. */
export function requestId(): string {
  return globalThis.crypto?.randomUUID?.() ?? uuidv4();
}

export type Reply<T> =
  | { ok: true; status: number; body: T; etag: string | null }
  | { ok: false; status: number; error: string; field?: string; body: Record<string, unknown> };

/** Sends a request and reads its JSON answer; a network failure answers status 0. */
export async function send<T>(path: string, init?: RequestInit): Promise<Reply<T>> {
  let res: Response;
  try {
    res = await fetch(path, { credentials: 'same-origin', cache: 'no-store', ...init });
  } catch {
    return {
      ok: false,
      status: 0,
      error: 'The server could not be reached; nothing was changed. Try again.',
      body: {},
    };
  }
  const body = (await res.json().catch(() => ({}))) as Record<string, unknown>;
  if (res.ok) return { ok: true, status: res.status, body: body as T, etag: res.headers.get('etag') };
  return {
    ok: false,
    status: res.status,
    error: typeof body.error === 'string' ? body.error : `The server answered ${res.status}.`,
    ...(typeof body.field === 'string' ? { field: body.field } : {}),
    body,
  };
}

/** JSON request options for a write. */
export function jsonWrite(method: 'PUT' | 'POST', body: unknown, headers: Record<string, string> = {}): RequestInit {
  return { method, headers: { 'Content-Type': 'application/json', ...headers }, body: JSON.stringify(body) };
}
