// The access matrix: every page and API route × anonymous, the owning student, another
// student, the assigned attending, an unassigned attending and a director — and the same
// requests under other spellings of the path (//admin, /./admin, /%5Cadmin, //%61dmin …),
// which Astro matches to the same route. A route file without a row here fails the test.
import { readdirSync, statSync } from 'node:fs';
import { request } from 'node:http';
import { join, relative, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PUBLIC_ROUTES, ROLE_ROUTES } from '../../src/lib/server/routes';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { ROOT } from '../helpers/paths';
import { startServer, type TestServer } from '../helpers/server';

const ACTORS = ['anonymous', 'owner', 'otherStudent', 'assigned', 'unassigned', 'director'] as const;
type Actor = (typeof ACTORS)[number];
/** Demo accounts in each part: Mira owns the case; Helen is her attending, Samuel is not. */
const ACCOUNT: Record<Exclude<Actor, 'anonymous'>, string> = {
  owner: DEMO.mira,
  otherStudent: DEMO.tomas,
  assigned: DEMO.helen,
  unassigned: DEMO.samuel,
  director: DEMO.ingrid,
};

interface Ids {
  caseId: string;
  canalId: string;
}
interface Row {
  method: 'GET' | 'POST' | 'PUT' | 'PATCH';
  path: (ids: Ids) => string;
  body?: unknown;
  /** The status each actor gets. */
  expect: Record<Actor, number>;
  /** Also try the path's other spellings. */
  variants?: boolean;
}

const signedIn = (status: number, anonymous: number): Record<Actor, number> => ({
  anonymous,
  owner: status,
  otherStudent: status,
  assigned: status,
  unassigned: status,
  director: status,
});
const readers = (anonymous: number): Record<Actor, number> => ({
  anonymous,
  owner: 200,
  otherStudent: 404,
  assigned: 200,
  unassigned: 404,
  director: 200,
});

/** Who may sign off and reopen: readers who are not the student (who gets 403); `status` for them. */
const reviewers = (status: number): Record<Actor, number> => ({
  anonymous: 401,
  owner: 403,
  otherStudent: 404,
  assigned: status,
  unassigned: 404,
  director: status,
});
// One request id per route: the same id on another route is a different request (409).
const MATRIX_ID = {
  signoffs: '00000000-0000-4000-8000-00000000a11c',
  reopen: '00000000-0000-4000-8000-00000000a11d',
  comments: '00000000-0000-4000-8000-00000000a11e',
  mail: '00000000-0000-4000-8000-00000000a11f',
  invite: '00000000-0000-4000-8000-00000000a120',
  inviteCsv: '00000000-0000-4000-8000-00000000a121',
  resend: '00000000-0000-4000-8000-00000000a122',
  revoke: '00000000-0000-4000-8000-00000000a123',
  accept: '00000000-0000-4000-8000-00000000a124',
  resetRequest: '00000000-0000-4000-8000-00000000a125',
  resetConfirm: '00000000-0000-4000-8000-00000000a126',
  userReset: '00000000-0000-4000-8000-00000000a127',
  deactivate: '00000000-0000-4000-8000-00000000a128',
  reactivate: '00000000-0000-4000-8000-00000000a129',
  role: '00000000-0000-4000-8000-00000000a12a',
  holds: '00000000-0000-4000-8000-00000000a12b',
  cohort: '00000000-0000-4000-8000-00000000a12c',
  assignments: '00000000-0000-4000-8000-00000000a12d',
  cohortCreate: '00000000-0000-4000-8000-00000000a12e',
  cohortUpdate: '00000000-0000-4000-8000-00000000a12f',
  settings: '00000000-0000-4000-8000-00000000a130',
};
/** Directors only: 403 for every other role, `status` for the director. */
const directors = (status: number, anonymous: number): Record<Actor, number> => ({
  anonymous,
  owner: 403,
  otherStudent: 403,
  assigned: 403,
  unassigned: 403,
  director: status,
});
/** A token no link was ever made with: the public link routes answer 404 to everyone. */
const NO_TOKEN = 'A'.repeat(43);
const MATRIX_PASSWORD = 'access matrix password 2026';

// No account or cohort has this id: the director's writes reach the service and change nothing (404).
const NO_ROW = 999999;

/** One row per route pattern (as Astro names it). */
const MATRIX: Record<string, Row[]> = {
  '/': [{ method: 'GET', path: () => '/', expect: signedIn(200, 302) }],
  '/404': [{ method: 'GET', path: () => '/no-such-page', expect: signedIn(404, 404) }],
  '/account': [{ method: 'GET', path: () => '/account', expect: signedIn(200, 302), variants: true }],
  '/admin': [
    {
      method: 'GET',
      path: () => '/admin',
      variants: true,
      expect: { anonymous: 302, owner: 403, otherStudent: 403, assigned: 403, unassigned: 403, director: 200 },
    },
  ],
  '/admin/accounts': [{ method: 'GET', path: () => '/admin/accounts', variants: true, expect: directors(200, 302) }],
  '/admin/cohorts': [{ method: 'GET', path: () => '/admin/cohorts', variants: true, expect: directors(200, 302) }],
  // Attendings and directors; students have their home page.
  '/cases': [
    {
      method: 'GET',
      path: () => '/cases',
      variants: true,
      expect: { anonymous: 302, owner: 403, otherStudent: 403, assigned: 200, unassigned: 200, director: 200 },
    },
  ],
  // Attendings may read the settings; only a director changes them (docs/settings.md).
  '/admin/settings': [
    {
      method: 'GET',
      path: () => '/admin/settings',
      variants: true,
      expect: { anonymous: 302, owner: 403, otherStudent: 403, assigned: 200, unassigned: 200, director: 200 },
    },
  ],
  '/admin/audit': [{ method: 'GET', path: () => '/admin/audit', variants: true, expect: directors(200, 302) }],
  '/admin/invitations': [
    { method: 'GET', path: () => '/admin/invitations', variants: true, expect: directors(200, 302) },
  ],
  // Public account pages (docs/accounts.md): open to anyone; an unknown link is 404.
  '/forgot-password': [{ method: 'GET', path: () => '/forgot-password', expect: signedIn(200, 200) }],
  '/invite/[token]': [{ method: 'GET', path: () => `/invite/${NO_TOKEN}`, expect: signedIn(404, 404) }],
  '/reset-password/[token]': [{ method: 'GET', path: () => `/reset-password/${NO_TOKEN}`, expect: signedIn(404, 404) }],
  '/cases/[caseId]': [{ method: 'GET', path: (i) => `/cases/${i.caseId}`, expect: readers(302), variants: true }],
  // Static and prerendered like the chairside shell, with no data in it: open to anyone.
  '/calculators': [{ method: 'GET', path: () => '/calculators', expect: signedIn(200, 200) }],
  '/chairside': [{ method: 'GET', path: () => '/chairside', expect: signedIn(200, 200) }],
  '/forbidden': [{ method: 'GET', path: () => '/forbidden', expect: signedIn(403, 302) }],
  '/signin': [{ method: 'GET', path: () => '/signin', expect: signedIn(302, 200) }],
  '/signout': [{ method: 'GET', path: () => '/signout', expect: signedIn(200, 302) }],
  '/api/auth/[...auth]': [
    { method: 'GET', path: () => '/api/auth/session', expect: signedIn(200, 200) },
    { method: 'GET', path: () => '/api/auth/providers', expect: signedIn(200, 200) },
    { method: 'GET', path: () => '/api/auth/signin', expect: signedIn(404, 404) },
  ],
  '/api/canals/[canalId]': [
    { method: 'GET', path: (i) => `/api/canals/${i.canalId}`, expect: readers(401), variants: true },
  ],
  '/api/cases': [
    { method: 'GET', path: () => '/api/cases', expect: signedIn(200, 401) },
    // The case list's filters: every reader may filter (within what they may read); a bad one is 400.
    { method: 'GET', path: () => '/api/cases?state=submitted&limit=5', expect: signedIn(200, 401) },
    { method: 'GET', path: () => '/api/cases?state=bogus', expect: signedIn(400, 401) },
  ],
  '/api/cases/[caseId]': [
    { method: 'GET', path: (i) => `/api/cases/${i.caseId}`, expect: readers(401), variants: true },
  ],
  // Bodies that pass validation but change nothing: a state no case is in, a canal of no case.
  '/api/cases/[caseId]/signoffs': [
    { method: 'GET', path: (i) => `/api/cases/${i.caseId}/signoffs`, expect: readers(401), variants: true },
    {
      method: 'POST',
      path: (i) => `/api/cases/${i.caseId}/signoffs`,
      body: { id: MATRIX_ID.signoffs, checkpoint: 'final', decision: 'approve', expectedState: 'discarded' },
      variants: true,
      expect: reviewers(409),
    },
  ],
  '/api/cases/[caseId]/reopen': [
    {
      method: 'POST',
      path: (i) => `/api/cases/${i.caseId}/reopen`,
      body: { id: MATRIX_ID.reopen, reason: 'access matrix', expectedState: 'discarded' },
      variants: true,
      expect: reviewers(409),
    },
  ],
  '/api/cases/[caseId]/comments': [
    { method: 'GET', path: (i) => `/api/cases/${i.caseId}/comments`, expect: readers(401), variants: true },
    {
      method: 'POST',
      path: (i) => `/api/cases/${i.caseId}/comments`,
      body: { id: MATRIX_ID.comments, canalId: '00000000-0000-4000-8000-00000000abcd', text: 'access matrix' },
      variants: true,
      expect: { anonymous: 401, owner: 400, otherStudent: 404, assigned: 400, unassigned: 404, director: 400 },
    },
  ],
  '/api/audit': [{ method: 'GET', path: () => '/api/audit', variants: true, expect: directors(200, 401) }],
  '/api/audit.csv': [{ method: 'GET', path: () => '/api/audit.csv', variants: true, expect: directors(200, 401) }],
  '/api/settings': [
    { method: 'GET', path: () => '/api/settings', expect: signedIn(200, 401) },
    // A name that is no setting: refused before anything is stored.
    {
      method: 'PUT',
      path: () => '/api/settings',
      body: { id: MATRIX_ID.settings, values: { noSuchSetting: 1 } },
      variants: true,
      expect: directors(400, 401),
    },
  ],
  '/api/settings/recompute': [
    { method: 'GET', path: () => '/api/settings/recompute', variants: true, expect: directors(200, 401) },
    // Not a request id: refused before anything starts.
    {
      method: 'POST',
      path: () => '/api/settings/recompute',
      body: { id: 'x' },
      variants: true,
      expect: directors(400, 401),
    },
  ],
  // The review queue: attendings (their own students' cases) and the director; students 403.
  '/review': [
    {
      method: 'GET',
      path: () => '/review',
      variants: true,
      expect: { anonymous: 302, owner: 403, otherStudent: 403, assigned: 200, unassigned: 200, director: 200 },
    },
  ],
  '/api/review/queue': [
    {
      method: 'GET',
      path: () => '/api/review/queue',
      variants: true,
      expect: { anonymous: 401, owner: 403, otherStudent: 403, assigned: 200, unassigned: 200, director: 200 },
    },
    // A bad parameter is refused only after the role check: a student still gets 403.
    {
      method: 'GET',
      path: () => '/api/review/queue?state=everything',
      expect: { anonymous: 401, owner: 403, otherStudent: 403, assigned: 400, unassigned: 400, director: 400 },
    },
  ],
  // Invitations (docs/accounts.md): bodies that cannot pass, or name nothing; nothing changes.
  '/api/invitations': [
    { method: 'GET', path: () => '/api/invitations', variants: true, expect: directors(200, 401) },
    {
      method: 'POST',
      path: () => '/api/invitations',
      body: { id: MATRIX_ID.invite, email: 'not an address', role: 'student' },
      variants: true,
      expect: directors(400, 401),
    },
  ],
  '/api/invitations/csv': [
    {
      method: 'POST',
      path: () => '/api/invitations/csv',
      body: { id: MATRIX_ID.inviteCsv, csv: 'name,email\n', role: 'student' },
      expect: directors(400, 401),
    },
  ],
  '/api/invitations/[invitationId]/resend': [
    {
      method: 'POST',
      path: () => '/api/invitations/99999/resend',
      body: { id: MATRIX_ID.resend },
      variants: true,
      expect: directors(404, 401),
    },
  ],
  '/api/invitations/[invitationId]/revoke': [
    {
      method: 'POST',
      path: () => '/api/invitations/99999/revoke',
      body: { id: MATRIX_ID.revoke },
      variants: true,
      expect: directors(404, 401),
    },
  ],
  '/api/invitations/[token]/accept': [
    {
      method: 'POST',
      path: () => `/api/invitations/${NO_TOKEN}/accept`,
      body: { id: MATRIX_ID.accept, name: 'Access Matrix', password: MATRIX_PASSWORD },
      expect: signedIn(404, 404),
    },
  ],
  // Password resets: the same 202 for an address with no account, which sends nothing.
  '/api/password-resets': [
    {
      method: 'POST',
      path: () => '/api/password-resets',
      body: { id: MATRIX_ID.resetRequest, email: 'nobody.at.all@larkfield.example' },
      expect: signedIn(202, 202),
    },
  ],
  '/api/password-resets/[token]': [
    {
      method: 'POST',
      path: () => `/api/password-resets/${NO_TOKEN}`,
      body: { id: MATRIX_ID.resetConfirm, password: MATRIX_PASSWORD },
      expect: signedIn(404, 404),
    },
  ],
  '/api/users/[userId]/password-reset': [
    {
      method: 'POST',
      path: () => '/api/users/99999/password-reset',
      body: { id: MATRIX_ID.userReset },
      variants: true,
      expect: directors(404, 401),
    },
  ],
  '/api/health': [{ method: 'GET', path: () => '/api/health', expect: signedIn(200, 200) }],
  '/api/me': [{ method: 'GET', path: () => '/api/me', expect: signedIn(200, 401) }],
  // A body that cannot pass validation: the matrix must change nothing.
  '/api/me/password': [
    { method: 'POST', path: () => '/api/me/password', body: { id: 'x' }, expect: signedIn(400, 401) },
  ],
  '/api/me/mail': [
    { method: 'GET', path: () => '/api/me/mail', expect: signedIn(200, 401) },
    // Not a boolean: refused before anything is stored.
    {
      method: 'POST',
      path: () => '/api/me/mail',
      body: { id: MATRIX_ID.mail, digest: 'yes' },
      expect: signedIn(400, 401),
    },
  ],
  '/api/users': [{ method: 'GET', path: () => '/api/users', variants: true, expect: directors(200, 401) }],
  '/api/users/[userId]/deactivate': [
    {
      method: 'POST',
      path: () => `/api/users/${NO_ROW}/deactivate`,
      body: { id: MATRIX_ID.deactivate },
      variants: true,
      expect: directors(404, 401),
    },
  ],
  '/api/users/[userId]/reactivate': [
    {
      method: 'POST',
      path: () => `/api/users/${NO_ROW}/reactivate`,
      body: { id: MATRIX_ID.reactivate },
      expect: directors(404, 401),
    },
  ],
  '/api/users/[userId]/role': [
    {
      method: 'POST',
      path: () => `/api/users/${NO_ROW}/role`,
      body: { id: MATRIX_ID.role, role: 'attending' },
      variants: true,
      expect: directors(404, 401),
    },
  ],
  '/api/users/[userId]/holds/lift': [
    {
      method: 'POST',
      path: () => `/api/users/${NO_ROW}/holds/lift`,
      body: { id: MATRIX_ID.holds },
      expect: directors(404, 401),
    },
  ],
  '/api/users/[userId]/cohort': [
    {
      method: 'POST',
      path: () => `/api/users/${NO_ROW}/cohort`,
      body: { id: MATRIX_ID.cohort, cohortId: null },
      expect: directors(404, 401),
    },
  ],
  '/api/users/[userId]/assignments': [
    { method: 'GET', path: () => `/api/users/${NO_ROW}/assignments`, expect: directors(404, 401) },
    {
      method: 'PUT',
      path: () => `/api/users/${NO_ROW}/assignments`,
      body: { id: MATRIX_ID.assignments, attendingIds: [] },
      expect: directors(404, 401),
    },
  ],
  '/api/cohorts': [
    { method: 'GET', path: () => '/api/cohorts', variants: true, expect: directors(200, 401) },
    // An empty name: refused before anything is stored.
    {
      method: 'POST',
      path: () => '/api/cohorts',
      body: { id: MATRIX_ID.cohortCreate, name: ' ' },
      expect: directors(400, 401),
    },
  ],
  '/api/cohorts/[cohortId]': [
    {
      method: 'PATCH',
      path: () => `/api/cohorts/${NO_ROW}`,
      body: { id: MATRIX_ID.cohortUpdate, archived: true },
      expect: directors(404, 401),
    },
  ],
  '/api/sync': [
    {
      method: 'POST',
      path: () => '/api/sync',
      body: { deviceId: 'access-matrix', events: [] },
      variants: true,
      expect: { anonymous: 401, owner: 200, otherStudent: 200, assigned: 403, unassigned: 403, director: 403 },
    },
  ],
};

/** Other spellings of a path that Astro matches to the same route. */
function spellings(path: string): string[] {
  const rest = path.slice(1);
  const first = rest.charCodeAt(0).toString(16);
  return [
    `/${path}`,
    `/./${path}`,
    `//.${path}`,
    `/%5C${rest}`,
    `//%${first}${rest.slice(1)}`,
    `/%${first}${rest.slice(1)}`,
  ];
}

/** Every route file under src/pages, as Astro's route pattern. */
function routePatterns(): string[] {
  const pagesDir = resolve(ROOT, 'src/pages');
  const files: string[] = [];
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const full = join(dir, name);
      if (statSync(full).isDirectory()) walk(full);
      else if (/\.(astro|ts|tsx|js|md|mdx)$/.test(name) && !name.startsWith('_')) files.push(full);
    }
  };
  walk(pagesDir);
  return files.map((f) => {
    const route = relative(pagesDir, f)
      .replace(/\.[^.]+$/, '')
      .replace(/(^|\/)index$/, '');
    return `/${route}`;
  });
}

/** Sends the path exactly as written (fetch would tidy its dots away). */
function raw(
  baseUrl: string,
  method: string,
  path: string,
  cookie: string,
  body?: unknown,
): Promise<{ status: number; text: string }> {
  const url = new URL(baseUrl);
  const payload = body === undefined ? undefined : JSON.stringify(body);
  const headers: Record<string, string> = { Cookie: cookie };
  if (payload !== undefined) Object.assign(headers, { 'Content-Type': 'application/json', Origin: baseUrl });
  return new Promise((resolveAnswer, reject) => {
    const req = request({ host: url.hostname, port: url.port, method, path, headers }, (res) => {
      let text = '';
      res.on('data', (d: Buffer) => (text += d.toString()));
      res.on('end', () => resolveAnswer({ status: res.statusCode ?? 0, text }));
    });
    req.on('error', reject);
    req.end(payload);
  });
}

let server: TestServer;
const cookies: Record<Actor, string> = { anonymous: '' } as Record<Actor, string>;
let ids: Ids;

beforeAll(async () => {
  server = await startServer();
  for (const actor of ACTORS) {
    if (actor === 'anonymous') continue;
    const api: ApiClient = await apiSignIn(server.baseUrl, ACCOUNT[actor], DEMO.password);
    cookies[actor] = api.cookie;
  }
  const list = (await (await fetch(`${server.baseUrl}/api/cases`, { headers: { Cookie: cookies.owner } })).json()) as {
    cases: { caseId: string; canals: { canalId: string }[] }[];
  };
  const withCanal = list.cases.find((c) => c.canals.length > 0)!;
  ids = { caseId: withCanal.caseId, canalId: withCanal.canals[0]!.canalId };
});
afterAll(async () => {
  await server?.stop();
});

describe('the access matrix', () => {
  it('has a row for every route, and every row names a route that exists', () => {
    const patterns = routePatterns().sort();
    expect(Object.keys(MATRIX).sort()).toEqual(patterns);
    for (const p of [...PUBLIC_ROUTES, ...Object.keys(ROLE_ROUTES)]) expect(patterns, p).toContain(p);
  });

  for (const [pattern, rows] of Object.entries(MATRIX)) {
    for (const row of rows) {
      it(`${row.method} ${pattern} answers each actor as its row says`, async () => {
        const path = row.path(ids);
        for (const actor of ACTORS) {
          const res = await raw(server.baseUrl, row.method, path, cookies[actor], row.body);
          expect(res.status, `${actor} ${row.method} ${path}`).toBe(row.expect[actor]);
        }
      });

      if (row.variants) {
        it(`${row.method} ${pattern} gives no more under other spellings of its path`, async () => {
          const reached = new Set<Actor>();
          for (const path of spellings(row.path(ids))) {
            for (const actor of ACTORS) {
              const res = await raw(server.baseUrl, row.method, path, cookies[actor], row.body);
              if (row.expect[actor] === 200) {
                if (res.status === 200) reached.add(actor);
                continue;
              }
              expect(res.status, `${actor} ${row.method} ${path}`).not.toBe(200);
              expect(res.text, `${actor} ${row.method} ${path}`).not.toContain('larkfield.example');
            }
          }
          // The spellings do reach the route: those allowed in get it under some spelling.
          for (const actor of ACTORS.filter((a) => row.expect[a] === 200)) expect(reached, actor).toContain(actor);
        });
      }
    }
  }
});
