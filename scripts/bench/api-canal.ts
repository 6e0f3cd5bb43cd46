/**
 * Canal read benchmark: GET /api/canals/{id} of the built server at 50 connections, spread
 * over 20,000 canals that the signed-in attending may read, against the same read done by a
 * bare node:http + better-sqlite3 handler (lib/bare-canal-server.ts) and against the same
 * server's cheapest endpoint (GET /api/health, no session). Each run has a warm-up, then
 * about 10 s measured; p95 is computed from every response's own latency.
 *   npm run bench api-canal   (or: tsx scripts/bench/api-canal.ts; needs `npm run build` first)
 * Targets: api.canal.p95_ms ≤ 25, api.canal.ratio_to_bare ≥ 0.1.
 */
import { spawn } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import autocannon from 'autocannon';
import Database from 'better-sqlite3';
import { prepareDb } from '../lib/dbtasks.ts';
import { freePort, startServer } from '../lib/server-process.ts';
import { apiSignIn, DEMO } from '../lib/api-client.ts';

const CANALS = 20_000;
const CONNECTIONS = 50;
const WARMUP_S = 3;
const DURATION_S = Number(process.env.BENCH_DURATION_S ?? 10);
// BENCH_ONLY=canal runs the server's canal read alone (for profiling it with SERVER_NODE_ARGS).
const ONLY_CANAL = process.env.BENCH_ONLY === 'canal';
// BENCH_OUT_DIR=/path/to/another/dist times another build (e.g. the one before a change) on the same data.
const OUT_DIR = process.env.BENCH_OUT_DIR;
const SECRET = 'api-canal-bench-secret-api-canal-bench-secret';
const UUID_G = /[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/gi;

interface Row {
  [column: string]: unknown;
}

/**
 * Clones one seeded canal (its case, its case-level and canal events, its derived state and
 * findings, all made by the real sync and rules) CANALS times under fresh ids, for the
 * students `helen` attends. Answers the new canal ids.
 */
function cloneCanals(file: string): string[] {
  const sqlite = new Database(file);
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('synchronous = FULL');
  sqlite.pragma('foreign_keys = ON');
  const helen = sqlite.prepare('select id from users where email = ?').get(DEMO.helen) as { id: number };
  const students = (
    sqlite.prepare('select student_id from assignments where attending_id = ?').all(helen.id) as {
      student_id: number;
    }[]
  ).map((r) => r.student_id);
  // The seeded canal with the most events, so the state and findings are those of a full canal.
  const pick = sqlite
    .prepare(
      `select canals.id, canals.case_id from canals join events on events.canal_id = canals.id
       where canals.status <> 'removed' group by canals.id order by count(*) desc limit 1`,
    )
    .get() as { id: string; case_id: string };
  const kase = sqlite.prepare('select * from cases where id = ?').get(pick.case_id) as Row;
  const canal = sqlite.prepare('select * from canals where id = ?').get(pick.id) as Row;
  const events = sqlite
    .prepare('select * from events where case_id = ? and (canal_id is null or canal_id = ?)')
    .all(pick.case_id, pick.id) as Row[];
  const findings = sqlite.prepare('select * from findings where canal_id = ?').all(pick.id) as Row[];

  const insert = (table: string, row: Row) =>
    sqlite.prepare(
      `insert into ${table} (${Object.keys(row).join(', ')}) values (${Object.keys(row)
        .map(() => '?')
        .join(', ')})`,
    );
  const insCase = insert('cases', kase);
  const insCanal = insert('canals', canal);
  const insEvent = insert('events', events[0]!);
  const { id: _findingId, ...finding } = findings[0] ?? { id: 0 };
  const insFinding = findings.length > 0 ? insert('findings', finding) : null;

  const ids: string[] = [];
  const cloneOne = (n: number) => {
    const map = new Map<string, string>();
    const fresh = (old: unknown) => {
      if (typeof old !== 'string') return old;
      const key = old.toLowerCase();
      if (!map.has(key)) map.set(key, randomUUID());
      return map.get(key)!;
    };
    const swap = (text: unknown) => (typeof text === 'string' ? text.replace(UUID_G, (u) => fresh(u) as string) : text);
    insCase.run(Object.values({ ...kase, id: fresh(kase.id), student_id: students[n % students.length] }));
    const canalId = fresh(canal.id) as string;
    insCanal.run(
      Object.values({ ...canal, id: canalId, case_id: fresh(canal.case_id), state_json: swap(canal.state_json) }),
    );
    for (const e of events)
      insEvent.run(
        Object.values({
          ...e,
          id: fresh(e.id),
          case_id: fresh(e.case_id),
          canal_id: e.canal_id ? fresh(e.canal_id) : null,
          data_json: swap(e.data_json),
          canonical: swap(e.canonical),
        }),
      );
    for (const { id: _id, ...f } of findings)
      insFinding!.run(
        Object.values({
          ...f,
          canal_id: canalId,
          case_id: fresh(f.case_id),
          event_id: f.event_id ? fresh(f.event_id) : null,
        }),
      );
    ids.push(canalId);
  };
  const batch = sqlite.transaction((from: number, to: number) => {
    for (let n = from; n < to; n++) cloneOne(n);
  });
  for (let n = 0; n < CANALS; n += 5000) batch(n, Math.min(CANALS, n + 5000));
  console.log(`seeded ${CANALS} canals of ${events.length} events and ${findings.length} findings each`);
  sqlite.close(); // checkpoints the WAL into the file, which the server then copies
  return ids;
}

function percentile(sorted: Float64Array, p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)] ?? NaN;
}

interface Figures {
  rps: number;
  p95: number;
  p50: number;
  /** The answering process's CPU time (user + system) per answer: far less swayed by other work on the machine. */
  cpuUs: number;
}

/** User + system CPU time of a process in µs, from /proc (Linux). */
function cpuTimeUs(pid: number): number {
  const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ');
  return ((Number(fields[11]) + Number(fields[12])) * 1_000_000) / 100; // clock ticks of 1/100 s
}

/** One autocannon run: `paths` round-robin, every answer must be a 200. */
async function load(
  baseUrl: string,
  pid: number,
  paths: string[],
  headers: Record<string, string>,
  seconds: number,
): Promise<Figures> {
  let next = 0;
  const latencies: number[] = [];
  let bad = 0;
  const cpu0 = cpuTimeUs(pid);
  const result = await new Promise<autocannon.Result>((ok, fail) => {
    const instance = autocannon(
      {
        url: baseUrl,
        connections: CONNECTIONS,
        duration: seconds,
        requests: [
          {
            method: 'GET',
            headers,
            setupRequest: (req) => ({ ...req, path: paths[next++ % paths.length]! }),
          },
        ],
      },
      (err, res) => (err ? fail(err) : ok(res)),
    );
    instance.on('response', (_client, statusCode, _bytes, responseTime) => {
      if (statusCode === 200) latencies.push(responseTime);
      else bad++;
    });
  });
  const cpu = cpuTimeUs(pid) - cpu0;
  if (bad > 0 || result.errors > 0 || result.timeouts > 0)
    throw new Error(
      `${baseUrl}${paths[0]}: ${bad} answers not 200, ${result.errors} errors, ${result.timeouts} timeouts`,
    );
  const sorted = Float64Array.from(latencies).sort();
  return {
    rps: latencies.length / result.duration,
    p95: percentile(sorted, 95),
    p50: percentile(sorted, 50),
    cpuUs: cpu / latencies.length,
  };
}

/** A warm-up, then the measured run. */
async function measure(
  name: string,
  target: { baseUrl: string; pid: number },
  paths: string[],
  headers: Record<string, string> = {},
) {
  await load(target.baseUrl, target.pid, paths, headers, WARMUP_S);
  const f = await load(target.baseUrl, target.pid, paths, headers, DURATION_S);
  console.log(
    `${name}: ${Math.round(f.rps)} requests/s, p50 ${f.p50.toFixed(1)} ms, p95 ${f.p95.toFixed(1)} ms, ${Math.round(f.cpuUs)} µs CPU a request`,
  );
  return f;
}

async function startBare(dbFile: string): Promise<{ baseUrl: string; pid: number; stop(): Promise<void> }> {
  const port = await freePort();
  const child = spawn(process.execPath, ['--import', 'tsx', resolve(import.meta.dirname, 'lib/bare-canal-server.ts')], {
    env: { ...process.env, DB_FILE: dbFile, AUTH_SECRET: SECRET, PORT: String(port) },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  await new Promise<void>((ok, fail) => {
    child.stdout!.once('data', () => ok());
    child.once('exit', (code) => fail(new Error(`the bare server exited (${code})`)));
  });
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    pid: child.pid!,
    async stop() {
      if (child.exitCode !== null) return;
      const exited = new Promise((r) => child.once('exit', r));
      child.kill('SIGTERM');
      await exited;
    },
  };
}

const dir = mkdtempSync(join(tmpdir(), 'coneline-bench-'));
const template = join(dir, 'template.sqlite');
await prepareDb(template, { seed: true });
const t0 = performance.now();
const canalIds = cloneCanals(template);
console.log(`database built in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
const server = await startServer({
  templateDb: template,
  env: { AUTH_SECRET: SECRET },
  ...(OUT_DIR ? { outDir: OUT_DIR } : {}),
});
let bare: Awaited<ReturnType<typeof startBare>> | null = null;
try {
  const api = await apiSignIn(server.baseUrl, DEMO.helen, DEMO.password);
  const headers = { cookie: api.cookie };
  const paths = canalIds.map((id) => `/api/canals/${id}`);
  bare = await startBare(server.dbFile);

  // Both must answer the same thing before either is timed.
  for (const path of [paths[0]!, paths[CANALS - 1]!]) {
    const [a, b] = await Promise.all(
      [server.baseUrl, bare.baseUrl].map(async (base) => {
        const res = await fetch(base + path, { headers });
        return `${res.status} ${await res.text()}`;
      }),
    );
    if (a !== b) throw new Error(`the bare handler answers differently:\n${a}\n${b}`);
  }

  const canal = await measure('server canal', server, paths, headers);
  console.log(`api.canal.rps: ${Math.round(canal.rps)}`);
  console.log(`api.canal.p95_ms: ${canal.p95.toFixed(1)}`);
  console.log(`api.canal.cpu_us_per_request: ${Math.round(canal.cpuUs)}`);
  if (!ONLY_CANAL) {
    const floor = await measure('server health', server, ['/api/health']);
    const bareRun = await measure('bare canal', bare, paths, headers);
    console.log(`api.canal.bare_rps: ${Math.round(bareRun.rps)}`);
    console.log(`api.floor.rps: ${Math.round(floor.rps)}`);
    console.log(`api.canal.ratio_to_bare: ${(canal.rps / bareRun.rps).toFixed(3)}`);
    console.log(`api.canal.ratio_to_floor: ${(canal.rps / floor.rps).toFixed(3)}`);
    console.log(`api.canal.bare_cpu_us_per_request: ${Math.round(bareRun.cpuUs)}`);
    console.log(`api.floor.cpu_us_per_request: ${Math.round(floor.cpuUs)}`);
    // The same ratios by CPU time a request, which other work on a shared machine sways far less.
    console.log(`api.canal.cpu_ratio_to_bare: ${(bareRun.cpuUs / canal.cpuUs).toFixed(3)}`);
    console.log(`api.canal.cpu_ratio_to_floor: ${(floor.cpuUs / canal.cpuUs).toFixed(3)}`);
  }
} finally {
  await bare?.stop();
  await server.stop();
  rmSync(dir, { recursive: true, force: true });
}
