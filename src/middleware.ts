// Session into Astro.locals and a coarse gate; every handler still authorises the data it
// touches (conventions.md).
import { defineMiddleware } from 'astro:middleware';
import { sessionOf } from './lib/server/session-cache';
import { userFromSession } from './lib/server/session';
import { jsonError } from './lib/server/http';

/** Pages anyone may open. The chairside shell is static and holds no data. */
const PUBLIC_PAGES = [/^\/signin\/?$/, /^\/chairside\/?$/, /^\/invite\//, /^\/reset-password/, /^\/forgot-password\/?$/];

/** Path prefixes and the roles allowed there. */
const ROLE_GATES: { prefix: string; roles: Role[] }[] = [
  { prefix: '/review', roles: ['attending', 'director'] },
  { prefix: '/admin', roles: ['director'] },
  { prefix: '/api/admin', roles: ['director'] },
  { prefix: '/reports', roles: ['director'] },
];

const SECURITY_HEADERS: Record<string, string> = {
  'X-Content-Type-Options': 'nosniff',
  'Referrer-Policy': 'same-origin',
  'Content-Security-Policy': "frame-ancestors 'none'; base-uri 'self'; object-src 'none'; form-action 'self'",
  'Permissions-Policy': 'camera=(self), geolocation=(), microphone=()',
};

function withHeaders(res: Response): Response {
  try {
    for (const [k, v] of Object.entries(SECURITY_HEADERS)) if (!res.headers.has(k)) res.headers.set(k, v);
  } catch {
    // Some responses (redirects made by Response.redirect) have immutable headers.
  }
  return res;
}

/** Pages for a signed-in user hold health records: no copy in the browser's cache. */
function noStore(res: Response): Response {
  try {
    res.headers.set('Cache-Control', 'no-store');
  } catch {
    // immutable headers (a redirect): nothing cached there anyway
  }
  return res;
}

export const onRequest = defineMiddleware(async (ctx, next) => {
  ctx.locals.user = null;
  if (ctx.isPrerendered) return next();
  const path = ctx.url.pathname;
  if (path.startsWith('/api/auth/')) return withHeaders(await next());

  let session: Awaited<ReturnType<typeof sessionOf>> = null;
  try {
    session = await sessionOf(ctx.request);
  } catch {
    session = null; // A malformed or foreign cookie is simply no session.
  }
  // Database faults are not "signed out": they surface as errors, so a tablet keeps its user.
  const user = await userFromSession(session);
  ctx.locals.user = user;

  const isApi = path.startsWith('/api/');
  if (!user) {
    if (isApi) return withHeaders(jsonError(401, 'Sign in first.'));
    if (!PUBLIC_PAGES.some((re) => re.test(path))) {
      const callbackUrl = encodeURIComponent(path + ctx.url.search);
      return ctx.redirect(`/signin?callbackUrl=${callbackUrl}`, 302);
    }
    return withHeaders(await next());
  }

  const gate = ROLE_GATES.find((g) => path === g.prefix || path.startsWith(g.prefix + '/'));
  if (gate && !gate.roles.includes(user.role)) {
    if (isApi) return withHeaders(jsonError(403, 'Your role may not do this.'));
    return noStore(withHeaders(await ctx.rewrite('/forbidden')));
  }
  return noStore(withHeaders(await next()));
});
