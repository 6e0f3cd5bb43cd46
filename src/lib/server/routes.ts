/**
 * Who may reach which route, by the route Astro matched (`context.routePattern`), never by
 * the raw path: Astro matches `//admin`, `/./admin` and `/%61dmin` to /admin while the path
 * keeps its spelling. Every page and endpoint is listed here; tests/api/access.test.ts holds
 * each one to its row. Handlers still check the rows of data they touch.
 */

/**
 * Routes anyone may reach. The chairside shell and the calculators are static, prerendered
 * files that hold no data (the server hands them out before any session is read, and the
 * service worker answers them offline); what a user may see comes from the API.
 */
export const PUBLIC_ROUTES: ReadonlySet<string> = new Set([
  '/signin',
  '/chairside',
  '/calculators',
  '/404',
  '/api/auth/[...auth]',
  '/api/health',
]);

/** Routes open to some roles only; any other signed-in route is open to every role. */
export const ROLE_ROUTES: Readonly<Record<string, readonly Role[]>> = {
  '/admin': ['director'],
  // Attendings may read the settings their students are judged by; only a director changes them.
  '/admin/settings': ['director', 'attending'],
  '/admin/audit': ['director'],
  '/api/settings/recompute': ['director'],
  '/api/audit': ['director'],
  '/api/audit.csv': ['director'],
  '/api/sync': ['student'],
  '/review': ['attending', 'director'],
  '/api/review/queue': ['attending', 'director'],
};

/** The roles a route is limited to, or null when any signed-in user may reach it. */
export function rolesFor(routePattern: string): readonly Role[] | null {
  return ROLE_ROUTES[routePattern] ?? null;
}

export function isPublicRoute(routePattern: string): boolean {
  return PUBLIC_ROUTES.has(routePattern);
}

export function isApiRoute(routePattern: string): boolean {
  return routePattern === '/api' || routePattern.startsWith('/api/');
}
