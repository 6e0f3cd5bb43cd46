/** Small helpers every endpoint uses to answer in the same shape. */

export function jsonError(status: number, error: string, extra?: Record<string, unknown>): Response {
  return Response.json({ error, ...extra }, { status, headers: { 'Cache-Control': 'no-store' } });
}

export function json(body: unknown, status = 200): Response {
  return Response.json(body, { status, headers: { 'Cache-Control': 'no-store' } });
}

/**
 * Astro's origin check covers form bodies only, so JSON writes compare Origin themselves
 * (stack-notes.md). Same origin = the scheme, host and port the request came to.
 */
export function sameOrigin(request: Request): boolean {
  const origin = request.headers.get('origin');
  if (!origin) return false;
  try {
    const o = new URL(origin);
    const host = request.headers.get('x-forwarded-host') ?? request.headers.get('host');
    if (!host) return false;
    return o.host === host;
  } catch {
    return false;
  }
}

export function isJson(request: Request): boolean {
  const type = request.headers.get('content-type') ?? '';
  return /^application\/json\s*(;|$)/i.test(type);
}
