/**
 * The one role check each role-only page and endpoint makes of its own (the middleware makes
 * the same check first, from src/lib/server/routes.ts; a page must not rely on it alone).
 */
import type { APIContext, AstroGlobal } from 'astro';
import { jsonError } from './http';
import { isApiRoute } from './routes';

type Context = Pick<APIContext, 'locals' | 'routePattern' | 'url' | 'redirect' | 'rewrite'> | AstroGlobal;

/** null when the signed-in user has one of `roles`; otherwise the answer to give instead. */
export async function requireRole(ctx: Context, roles: readonly Role[]): Promise<Response | null> {
  const user = ctx.locals.user;
  const api = isApiRoute(ctx.routePattern);
  if (!user) {
    if (api) return jsonError(401, 'Sign in first.');
    return ctx.redirect(`/signin?callbackUrl=${encodeURIComponent(ctx.url.pathname + ctx.url.search)}`, 302);
  }
  if (roles.includes(user.role)) return null;
  if (api) return jsonError(403, 'Your role may not do this.');
  return ctx.rewrite('/forbidden');
}
