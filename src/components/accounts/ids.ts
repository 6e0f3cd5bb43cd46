/**
 * A new request id (UUID v4) for a form's submission. `crypto.randomUUID` exists only in a
 * secure context; `getRandomValues` everywhere. Kept apart from the tablet's id helpers so
 * these forms share no module with the chairside's first paint.
 */
export function newRequestId(): string {
  if (typeof crypto.randomUUID === 'function') return crypto.randomUUID();
  const b = crypto.getRandomValues(new Uint8Array(16));
  b[6] = (b[6]! & 0x0f) | 0x40;
  b[8] = (b[8]! & 0x3f) | 0x80;
  const h = [...b].map((x) => x.toString(16).padStart(2, '0')).join('');
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}

/** Posts JSON; answers the status and the parsed body (status 0 when the server could not be reached). */
export async function postJson(url: string, body: unknown): Promise<{ status: number; body: Record<string, unknown> }> {
  try {
    const res = await fetch(url, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify(body),
      credentials: 'same-origin',
    });
    const parsed = (await res.json().catch(() => ({}))) as Record<string, unknown>;
    return { status: res.status, body: parsed };
  } catch {
    return { status: 0, body: { error: 'The server could not be reached; nothing was sent. Try again.' } };
  }
}
