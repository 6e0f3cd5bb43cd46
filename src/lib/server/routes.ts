/**
 * Who may reach which route, by the route Astro matched (`context.routePattern`), never by
 * the raw path: Astro matches `//admin`, `/./admin` and `/%61dmin` to /admin while the path
 * keeps its spelling. Every page and endpoint is listed here; tests/api/access.test.ts holds
 * each one to its row. Handlers still check the rows of data they touch.
 */

/**
 * The invitation and password-reset routes anyone may reach (docs/accounts.md): someone with
 * no account yet, or one who cannot sign in. Each write checks Origin, each is rate-limited
 * per client address and per target (public-limits.ts), and a reset request answers the same
 * whether or not the address has an account. Pages with a token in their address send
 * `Referrer-Policy: no-referrer` and `Cache-Control: no-store`.
 */
export const ACCOUNT_PUBLIC_ROUTES = [
  '/invite/[token]',
  '/forgot-password',
  '/reset-password/[token]',
  '/api/invitations/[token]/accept',
  '/api/password-resets',
  '/api/password-resets/[token]',
] as const;

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
  ...ACCOUNT_PUBLIC_ROUTES,
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
  // Accounts, cohorts and assignments (docs/accounts.md).
  '/admin/accounts': ['director'],
  '/admin/cohorts': ['director'],
  '/api/users': ['director'],
  '/api/users/[userId]/deactivate': ['director'],
  '/api/users/[userId]/reactivate': ['director'],
  '/api/users/[userId]/role': ['director'],
  '/api/users/[userId]/holds/lift': ['director'],
  '/api/users/[userId]/cohort': ['director'],
  '/api/users/[userId]/assignments': ['director'],
  '/api/cohorts': ['director'],
  '/api/cohorts/[cohortId]': ['director'],
  // The case list: a student's own cases are on their home page.
  '/cases': ['attending', 'director'],
  '/review': ['attending', 'director'],
  '/api/review/queue': ['attending', 'director'],
  // Invitations and sending a reset link (docs/accounts.md).
  '/admin/invitations': ['director'],
  '/api/invitations': ['director'],
  '/api/invitations/csv': ['director'],
  '/api/invitations/[invitationId]/resend': ['director'],
  '/api/invitations/[invitationId]/revoke': ['director'],
  '/api/users/[userId]/password-reset': ['director'],
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
