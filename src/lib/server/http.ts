/** Small helpers every endpoint uses to answer in the same shape. */

export function jsonError(status: number, error: string, extra?: Record<string, unknown>): Response {
  return Response.json({ error, ...extra }, { status, headers: { 'Cache-Control': 'no-store' } });
}

export function json(body: unknown, status = 200): Response {
  return Response.json(body, { status, headers: { 'Cache-Control': 'no-store' } });
}

/**
 * Astro's origin check covers form bodies only, so JSON writes compare Origin themselves.
 * Same origin = the scheme, host and port of the request as Astro resolved
 * it from the allowed Host / X-Forwarded-* headers (astro.config.mjs, allowedDomains).
 */
export function sameOrigin(request: Request): boolean {
  const origin = request.headers.get('origin');
  if (!origin) return false;
  try {
    return new URL(origin).origin === new URL(request.url).origin;
  } catch {
    return false;
  }
}

export function isJson(request: Request): boolean {
  const type = request.headers.get('content-type') ?? '';
  return /^application\/json\s*(;|$)/i.test(type);
}
