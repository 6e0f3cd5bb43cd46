/**
 * The floor under GET /api/canals/{id}: the same work with nothing around it. A plain
 * node:http server over better-sqlite3 that decodes the same Auth.js session cookie (same
 * secret, same salt, cached by token as src/lib/server/session-cache.ts does), looks the same
 * session up on every request (src/lib/server/sessions.ts, sessionUser), reads the same canal
 * rows, checks the same read access (src/lib/server/access.ts) and answers the same JSON.
 * Started by scripts/bench/api-canal.ts as its own process:
 *   DB_FILE=… AUTH_SECRET=… PORT=… node --import tsx scripts/bench/lib/bare-canal-server.ts
 */
import { createServer, type ServerResponse } from 'node:http';
import { decode } from '@auth/core/jwt';
import Database from 'better-sqlite3';

const COOKIE = 'authjs.session-token';
const TOKEN = /(?:^|;\s*)(?:__Secure-)?authjs\.session-token=([^;]+)/;
const UUID_RE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const KEEP_MS = 60_000;
const MAX_ENTRIES = 1000;
const PREFIX = '/api/canals/';

const secret = process.env.AUTH_SECRET ?? '';
const sqlite = new Database(process.env.DB_FILE ?? '', { fileMustExist: true });
sqlite.pragma('journal_mode = WAL');
sqlite.pragma('synchronous = FULL');
sqlite.pragma('foreign_keys = ON');
sqlite.pragma('busy_timeout = 5000');

interface Token {
  uid?: unknown;
  sid?: unknown;
  exp?: number;
}
interface UserRow {
  id: number;
  role: string;
}
interface CanalRow {
  id: string;
  case_id: string;
  state_json: string;
  review_status: string | null;
}
interface FindingRow {
  canal_id: string;
  code: string;
  severity: string;
  event_id: string | null;
  message: string;
}

const sessionUser = sqlite.prepare<[string, string], UserRow>(
  `select users.* from sessions inner join users on users.id = sessions.user_id
   where sessions.id = ? and sessions.ended_at is null and sessions.expires_at > ? and users.active = 1 limit 1`,
);
const canalRow = sqlite.prepare<[string], CanalRow>(
  `select canals.id, canals.case_id, canals.state_json, cases.review_status from canals
   inner join cases on cases.id = canals.case_id
   where canals.status <> 'removed' and canals.id = ? order by canals.id`,
);
const findingRows = sqlite.prepare<[string], FindingRow>(
  'select canal_id, code, severity, event_id, message from findings where canal_id in (?) order by id',
);
const caseRow = sqlite.prepare<[string], { student_id: number }>('select * from cases where id = ? limit 1');
const assignment = sqlite.prepare<[number, number], unknown>(
  'select * from assignments where attending_id = ? and student_id = ? limit 1',
);

const cache = new Map<string, { token: Token | null; until: number }>();

async function tokenOf(cookie: string, now: number): Promise<Token | null> {
  const raw = TOKEN.exec(cookie)?.[1];
  if (!raw) return null;
  const hit = cache.get(raw);
  if (hit && hit.until > now) return hit.token;
  let token: Token | null = null;
  try {
    token = await decode<Token>({ token: raw, secret, salt: COOKIE });
  } catch {
    token = null;
  }
  const expires = token?.exp ? token.exp * 1000 : now;
  cache.set(raw, { token, until: Math.min(now + KEEP_MS, expires) });
  if (cache.size > MAX_ENTRIES) cache.delete(cache.keys().next().value!);
  return token;
}

function send(res: ServerResponse, status: number, body: unknown): void {
  const text = JSON.stringify(body);
  res.writeHead(status, {
    'Content-Type': 'application/json',
    'Content-Length': Buffer.byteLength(text),
    'Cache-Control': 'no-store',
  });
  res.end(text);
}

const server = createServer(async (req, res) => {
  const url = req.url ?? '/';
  if (req.method !== 'GET' || !url.startsWith(PREFIX)) return send(res, 404, { error: 'Not found.' });
  const now = Date.now();
  const token = await tokenOf(req.headers.cookie ?? '', now);
  const sid = typeof token?.sid === 'string' && token.sid.length > 0 && token.sid.length <= 64 ? token.sid : null;
  const user = sid ? sessionUser.get(sid, new Date(now).toISOString()) : undefined;
  if (!user || Number(token?.uid) !== user.id) return send(res, 401, { error: 'Sign in first.' });

  const canalId = decodeURIComponent(url.slice(PREFIX.length).split('?')[0]!);
  const notFound = () => send(res, 404, { error: 'No such canal.' });
  if (!UUID_RE.test(canalId)) return notFound();
  const row = canalRow.get(canalId);
  if (!row) return notFound();
  const c = caseRow.get(row.case_id);
  const readable =
    c &&
    (user.role === 'director' ||
      (user.role === 'student' ? c.student_id === user.id : Boolean(assignment.get(user.id, c.student_id))));
  if (!readable) return notFound();
  const state = JSON.parse(row.state_json) as { status: string };
  const review = row.review_status ?? 'open';
  send(res, 200, {
    canalId: row.id,
    caseId: row.case_id,
    state: review === 'approved' || review === 'returned' ? { ...state, status: review } : state,
    findings: findingRows.all(row.id).map((f) => ({
      code: f.code,
      severity: f.severity,
      ...(f.event_id ? { eventId: f.event_id } : {}),
      message: f.message,
    })),
  });
});
server.keepAliveTimeout = 5_000;
server.listen(Number(process.env.PORT), '127.0.0.1', () => console.log('bare canal server listening'));
const stop = () => server.close(() => process.exit(0));
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
