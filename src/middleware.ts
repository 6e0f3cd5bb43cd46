// Session into Astro.locals and a coarse gate by the matched route; every handler still
// authorises the data it touches. Security headers are set on every
// response by the server entry (scripts/server.mjs), static files included.
import { defineMiddleware } from 'astro:middleware';
import { jsonError } from './lib/server/http';
import { offerFastLane } from './lib/server/fast-lane';
import { isApiRoute, isPublicRoute, rolesFor } from './lib/server/routes';
import { userFromSession } from './lib/server/session';
import { sessionOf } from './lib/server/session-cache';

// The API's hot canal read may skip Astro's pipeline when it is ordinary (fast-lane.ts).
offerFastLane();

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
  ctx.locals.sessionId = null;
  if (ctx.isPrerendered) return next();
  const route = ctx.routePattern;
  // Auth.js's endpoints read their own session (our route limits them first).
  if (route === '/api/auth/[...auth]') return noStore(await next());

  let session: Awaited<ReturnType<typeof sessionOf>> = null;
  try {
    session = await sessionOf(ctx.request);
  } catch {
    session = null; // A malformed or foreign cookie is simply no session.
  }
  // Database faults are not "signed out": they surface as errors, so a tablet keeps its user.
  const signedIn = await userFromSession(session);
  const user = signedIn?.user ?? null;
  ctx.locals.user = user;
  ctx.locals.sessionId = signedIn?.sessionId ?? null;

  const api = isApiRoute(route);
  if (!user) {
    if (isPublicRoute(route)) return next();
    if (api) return jsonError(401, 'Sign in first.');
    const callbackUrl = encodeURIComponent(ctx.url.pathname + ctx.url.search);
    return ctx.redirect(`/signin?callbackUrl=${callbackUrl}`, 302);
  }

  const roles = rolesFor(route);
  if (roles && !roles.includes(user.role)) {
    if (api) return jsonError(403, 'Your role may not do this.');
    return noStore(await ctx.rewrite('/forbidden'));
  }
  return noStore(await next());
});
