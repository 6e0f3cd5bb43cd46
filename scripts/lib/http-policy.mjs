/**
 * What the server entry (scripts/server.mjs) decides about every request before Astro sees
 * it: the client's address, whether it came over HTTPS, its time limit and the headers every
 * response carries. Pure functions, so tests can hold them to their rules.
 */
import { isIP } from 'node:net';

/**
 * The policy for responses that bring none of their own (JSON, static files, the service
 * worker). Pages send Astro's policy instead, which hashes their inline scripts; both forbid
 * framing. 'self' rather than 'none' for scripts and connections, because the service worker
 * is governed by the policy of its own script's response and must fetch the app to precache it.
 */
export const DEFAULT_CSP = [
  "default-src 'self'",
  "script-src 'self'",
  "object-src 'none'",
  "base-uri 'none'",
  "form-action 'self'",
  "frame-ancestors 'none'",
].join('; ');

/** Headers set on every response; a response may replace the policy with its own. */
export function securityHeaders({ hsts = false } = {}) {
  return {
    'Content-Security-Policy': DEFAULT_CSP,
    'X-Content-Type-Options': 'nosniff',
    'Referrer-Policy': 'same-origin',
    'X-Frame-Options': 'DENY',
    'Cross-Origin-Opener-Policy': 'same-origin',
    'Cross-Origin-Resource-Policy': 'same-origin',
    'Permissions-Policy': 'camera=(self), microphone=(), geolocation=(), payment=(), usb=()',
    // A year, only for the school's real host over HTTPS (never localhost or an address):
    // browsers would otherwise refuse plain HTTP to that name for the whole year.
    ...(hsts ? { 'Strict-Transport-Security': 'max-age=31536000' } : {}),
  };
}

/**
 * Routes whose requests may take longer than the default (uploads, later). The first prefix
 * that matches wins; everything else gets the default (REQUEST_TIMEOUT_MS, 30 s).
 * @type {{ prefix: string, ms: number }[]}
 */
export const ROUTE_TIMEOUTS = [];

/** How long a request to `url` may take, in milliseconds. */
export function routeTimeoutMs(url, defaultMs, table = ROUTE_TIMEOUTS) {
  const path = url.split('?')[0];
  return table.find((r) => path === r.prefix || path.startsWith(r.prefix + '/'))?.ms ?? defaultMs;
}

/** An IPv4 address mapped into IPv6 (::ffff:10.0.0.5) is written as IPv4. */
function plain(address) {
  return address.startsWith('::ffff:') && isIP(address.slice(7)) === 4 ? address.slice(7) : address;
}

/**
 * The client's address: the socket's, unless the server sits behind the school's TLS proxy
 * (TRUST_PROXY=1). Then it is the last X-Forwarded-For entry, the one our proxy appended;
 * earlier entries come from the client and prove nothing.
 */
export function decideClientAddress(req, trustProxy) {
  const socketAddress = plain(req.socket?.remoteAddress ?? '');
  if (!trustProxy) return socketAddress || 'unknown';
  const forwarded = String(req.headers['x-forwarded-for'] ?? '')
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean);
  const last = forwarded.at(-1);
  return last && isIP(plain(last)) ? plain(last) : socketAddress || 'unknown';
}

/** True when the request reached us over TLS, or our trusted proxy says it reached it so. */
export function cameOverHttps(req, trustProxy) {
  if (req.socket?.encrypted) return true;
  if (!trustProxy) return false;
  return (
    String(req.headers['x-forwarded-proto'] ?? '')
      .split(',')[0]
      .trim()
      .toLowerCase() === 'https'
  );
}
