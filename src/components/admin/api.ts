/**
 * How the director's screens talk to the API: JSON writes with a client-made request id, and
 * the answer read into one shape. A write that got no answer (the network failed) keeps its id,
 * so sending the same thing again is the same request; anything else gets a new id.
 */
import { useRef } from 'react';
import { v4 as uuidv4 } from 'uuid';
import type { ErrorAnswer } from '../../lib/contract';

export interface Reply<T> {
  /** 0 when no answer came. */
  status: number;
  ok: boolean;
  body: T | null;
  error: ErrorAnswer | null;
}

const NO_ANSWER = 'The server could not be reached; nothing was changed. Try again.';

export async function call<T>(method: string, path: string, body?: object): Promise<Reply<T>> {
  const res = await fetch(path, {
    method,
    headers: body ? { 'Content-Type': 'application/json' } : undefined,
    body: body ? JSON.stringify(body) : undefined,
  }).catch(() => null);
  if (!res) return { status: 0, ok: false, body: null, error: { error: NO_ANSWER } };
  const json = (await res.json().catch(() => null)) as unknown;
  if (res.ok) return { status: res.status, ok: true, body: json as T, error: null };
  const error = (json as ErrorAnswer | null) ?? { error: `The server answered ${res.status}.` };
  return { status: res.status, ok: false, body: null, error };
}

export function newRequestId(): string {
  return globalThis.crypto?.randomUUID?.() ?? uuidv4();
}

/**
 * A sender of one kind of write: the request id stays while the same body waits for its first
 * answer, and is new for a new body or once an answer came.
 */
export function useWrite<T>(method: string): (path: string, body: object) => Promise<Reply<T>> {
  const pending = useRef<{ key: string; id: string } | null>(null);
  return async (path, body) => {
    const key = `${path}\n${JSON.stringify(body)}`;
    if (pending.current?.key !== key) pending.current = { key, id: newRequestId() };
    const reply = await call<T>(method, path, { id: pending.current.id, ...body });
    if (reply.status !== 0) pending.current = null;
    return reply;
  };
}
