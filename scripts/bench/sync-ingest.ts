/**
 * Sync ingest benchmark: 10,000 events for 100 canals sent in batches of 500 through
 * /api/sync of the built server, against the same rows inserted with plain better-sqlite3
 * in transactions of 500 with the same pragmas (WAL, synchronous=FULL).
 *   npm run bench   (or: tsx scripts/bench/sync-ingest.ts; needs `npm run build` first)
 */
import { randomUUID } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { prepareDb } from '../lib/dbtasks.ts';
import { startServer } from '../lib/server-process.ts';
import { apiSignIn, DEMO } from '../lib/api-client.ts';

const CANALS = 100;
const PER_CANAL = 100;
const BATCH = 500;

interface Ev {
  id: string;
  caseId: string;
  canalId?: string;
  type: string;
  at: string;
  data: Record<string, unknown>;
}

/** One canal on an extracted tooth, 100 events: set-up, checks, 46 compaction cycles, finish. */
function canalEvents(start: number): Ev[] {
  const caseId = randomUUID();
  const canalId = randomUUID();
  let t = start;
  const out: Ev[] = [];
  const add = (type: string, data: Record<string, unknown> = {}, canal = true) =>
    out.push({
      id: randomUUID(),
      caseId,
      ...(canal ? { canalId } : {}),
      type,
      at: new Date((t += 1000)).toISOString(),
      data,
    });
  add('case.opened', { setting: 'extracted', tooth: 46 }, false);
  add('canal.added', {
    name: 'D',
    referencePoint: 'distobuccal cusp tip',
    cwlMm: 26,
    mafSize: '35',
    preparation: 'step-back',
    spreader: 'MF',
    accessorySize: 'MF',
  });
  add('seat.checked', { fileSize: '35', lengthMm: 26, result: 'seated' });
  add('taper.checked', { spreader: 'MF', depthMm: 25 });
  add('canal.rinsed', { solutions: ['naocl', 'edta'] });
  add('canal.dried', { pointSize: 'medium', measuredMm: 26 });
  add('master.fitted', { size: '35', lengthMm: 26, reachedLength: true });
  add('master.seated', { sealer: 'epoxy-resin' });
  for (let i = 0; i < 43; i++) {
    const depth = 24.5 - i * 0.5;
    add('spreader.placed', { spreader: 'MF', depthMm: depth });
    add('accessory.placed', { size: 'MF', lengthMm: depth, reachedLength: true });
  }
  add('fill.assessed', { length: 'flush', voids: false });
  add('gp.seared', { atOrifice: true, relativeToCejMm: 1 });
  add('gp.compacted');
  add('chamber.cleaned', { agent: 'alcohol' });
  add('note.added', { text: 'bench' });
  add('note.added', { text: 'bench' });
  return out;
}

const dir = mkdtempSync(join(tmpdir(), 'coneline-bench-'));
const template = join(dir, 'template.sqlite');
await prepareDb(template, { seed: true });
const server = await startServer({ templateDb: template });
try {
  const api = await apiSignIn(server.baseUrl, DEMO.mira, DEMO.password);
  const base = Date.now() - 7 * 86_400_000;
  const events = Array.from({ length: CANALS }, (_, i) => canalEvents(base + i * 200_000)).flat();
  if (events.length !== CANALS * PER_CANAL)
    throw new Error(`expected ${CANALS * PER_CANAL} events, made ${events.length}`);

  // Warm-up on other ids, so the first timed batch does not pay for the JIT alone.
  await api.post('/api/sync', { deviceId: 'bench', events: canalEvents(base - 86_400_000) });

  const t0 = performance.now();
  for (let i = 0; i < events.length; i += BATCH) {
    const res = await api.post('/api/sync', { deviceId: 'bench', events: events.slice(i, i + BATCH) });
    const body = (await res.json()) as { results: { status: string; error?: string }[] };
    const bad = body.results.find((r) => r.status !== 'stored');
    if (res.status !== 200 || bad) throw new Error(`batch ${i / BATCH}: ${res.status} ${JSON.stringify(bad)}`);
  }
  const ingestS = (performance.now() - t0) / 1000;

  // The same rows, inserted plainly.
  const rawFile = join(dir, 'raw.sqlite');
  await prepareDb(rawFile);
  const raw = new Database(rawFile);
  raw.pragma('journal_mode = WAL');
  raw.pragma('synchronous = FULL');
  raw.pragma('foreign_keys = ON');
  raw.prepare("insert into users (email, name, role) values ('bench@example.org', 'Bench', 'student')").run();
  const insCase = raw.prepare(
    "insert into cases (id, student_id, setting, tooth, opened_at) values (?, 1, 'extracted', 46, ?)",
  );
  const insCanal = raw.prepare(
    "insert into canals (id, case_id, name, status, state_json) values (?, ?, 'D', 'set-up', '{}')",
  );
  for (const e of events) {
    if (e.type === 'case.opened') insCase.run(e.caseId, e.at);
    if (e.type === 'canal.added') insCanal.run(e.canalId, e.caseId);
  }
  const insEvent = raw.prepare(
    'insert into events (id, case_id, canal_id, type, at, data_json, canonical, user_id, device_id, received_at) values (?, ?, ?, ?, ?, ?, ?, 1, ?, ?)',
  );
  const insertBatch = raw.transaction((rows: Ev[]) => {
    const now = new Date().toISOString();
    for (const e of rows)
      insEvent.run(
        e.id,
        e.caseId,
        e.canalId ?? null,
        e.type,
        e.at,
        JSON.stringify(e.data),
        JSON.stringify(e),
        'bench',
        now,
      );
  });
  const t1 = performance.now();
  for (let i = 0; i < events.length; i += BATCH) insertBatch(events.slice(i, i + BATCH));
  const rawS = (performance.now() - t1) / 1000;
  raw.close();

  const ingest = events.length / ingestS;
  const rawRate = events.length / rawS;
  console.log(`sync.ingest.events_per_s: ${Math.round(ingest)}`);
  console.log(`sync.raw_insert.rows_per_s: ${Math.round(rawRate)}`);
  console.log(`sync.ingest.ratio_to_raw: ${(ingest / rawRate).toFixed(3)}`);
} finally {
  await server.stop();
  rmSync(dir, { recursive: true, force: true });
}
