// Model tests of the sync contract against the real built server and its SQLite file.
import fc from 'fast-check';
import knexFactory, { type Knex } from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import { evaluateCanal, parseEvent, type LogEvent } from '../../src/lib/rules/index';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { EventWriter, type WireEvent } from '../helpers/events';
import { startServer, type TestServer } from '../helpers/server';

const SEED = 20261202;
let server: TestServer;
let api: ApiClient;
let k: Knex;

beforeAll(async () => {
  server = await startServer();
  api = await apiSignIn(server.baseUrl, DEMO.priya, DEMO.password);
  k = knexFactory(sqliteOptions(server.dbFile));
});
afterAll(async () => {
  await k?.destroy();
  await server?.stop();
});

interface Result {
  id: string | null;
  status: string;
  retry?: boolean;
}

/** A random procedure: 1–2 canals, some of the steps, maybe a void, maybe a bad event. */
function scenario(s: {
  setting: 'block' | 'extracted' | 'patient';
  canals: number;
  cones: number;
  keep: boolean[];
  voidAt: number | null;
  bad: boolean;
}) {
  const w = new EventWriter();
  w.open(s.setting, 36);
  const ids = Array.from({ length: s.canals }, (_, i) => w.canal(['MB', 'D'][i]!, 20 + i));
  for (const id of ids) w.textbook(id, 20 + ids.indexOf(id), s.cones);
  // Drop some steps (never the case or canal set-up) so canals end in every state.
  const kept = w.events.filter(
    (e, i) => e.type === 'case.opened' || e.type === 'canal.added' || s.keep[i % s.keep.length],
  );
  if (s.voidAt !== null && kept.length > 1 + s.canals) {
    const targets = kept.filter((e) => e.type !== 'case.opened');
    const target = targets[s.voidAt % targets.length]!;
    kept.push({ ...w.add('event.voided', { eventId: target.id, reason: 'tapped by mistake' }, target.canalId) });
  }
  if (s.bad) kept.push({ ...w.add('spreader.placed', { spreader: 'MF', depthMm: 99 }, ids[0]) });
  return { caseId: w.caseId, canalIds: ids, events: kept };
}

describe('syncing in any batching, order and repetition', () => {
  it('ends with exactly the events sent, once each, and findings equal to the rules run on them', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.record({
          setting: fc.constantFrom('block' as const, 'extracted' as const, 'patient' as const),
          canals: fc.integer({ min: 1, max: 2 }),
          cones: fc.integer({ min: 0, max: 5 }),
          keep: fc.array(fc.boolean(), { minLength: 1, maxLength: 7 }),
          voidAt: fc.option(fc.nat(), { nil: null }),
          bad: fc.boolean(),
          sizes: fc.array(fc.integer({ min: 1, max: 15 }), { minLength: 1, maxLength: 6 }),
          shuffle: fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 1, maxLength: 60 }),
          repeats: fc.array(fc.boolean(), { minLength: 1, maxLength: 6 }),
          cuts: fc.array(fc.boolean(), { minLength: 1, maxLength: 6 }),
        }),
        async (s) => {
          const sc = scenario(s);
          const valid = new Map<string, WireEvent>();
          for (const e of sc.events) if (parseEvent(e).ok) valid.set(e.id, e);
          // The tablet's outbox: recorded order, a random local shuffle inside each batch.
          let outbox = [...sc.events];
          let round = 0;
          while (outbox.length > 0 && round < 500) {
            const size = s.sizes[round % s.sizes.length]!;
            const batch = outbox
              .slice(0, size)
              .map((e, i) => ({ e, key: s.shuffle[(round * 7 + i) % s.shuffle.length]! }))
              .sort((a, b) => a.key - b.key)
              .map((x) => x.e);
            const send = async () =>
              (await api.post('/api/sync', { deviceId: 'model', events: batch })).json() as Promise<{
                results: Result[];
              }>;
            const answer = await send();
            if (s.repeats[round % s.repeats.length]) await send(); // a double send
            if (s.cuts[round % s.cuts.length] && round < 20) {
              round++;
              continue; // the answer was lost: the outbox keeps everything and sends again
            }
            const done = new Set(
              answer.results
                .filter(
                  (r) => r.status === 'stored' || r.status === 'duplicate' || (r.status === 'rejected' && !r.retry),
                )
                .map((r) => r.id),
            );
            outbox = outbox.filter((e) => !done.has(e.id));
            round++;
          }
          expect(outbox).toEqual([]);
          const rows = (await k('events').where({ case_id: sc.caseId }).select('id')) as { id: string }[];
          expect(rows.map((r) => r.id).sort()).toEqual([...valid.keys()].sort());
          const events = [...valid.values()].map((e) => (parseEvent(e) as { ok: true; event: LogEvent }).event);
          for (const canalId of sc.canalIds) {
            const expected = evaluateCanal(canalId, events);
            const res = await api.fetch(`/api/canals/${canalId}`);
            if (expected === null) {
              expect(res.status).toBe(404); // its canal.added was voided
              continue;
            }
            const stored = (await res.json()) as { findings: unknown[]; state: unknown };
            expect(stored.findings).toEqual(JSON.parse(JSON.stringify(expected.findings)));
            expect(stored.state).toEqual(JSON.parse(JSON.stringify(expected.state)));
          }
        },
      ),
      { seed: SEED, numRuns: 1000, verbose: 1 },
    );
  }, 600_000);
});

describe('fuzzed sync bodies', () => {
  it('never get an answer outside the contract and never change the database', async () => {
    const before = await k('events').count({ n: '*' }).first();
    const ALLOWED = new Set([200, 400, 401, 403, 413, 415]);
    const eventish = fc.record(
      {
        id: fc.oneof(fc.uuid(), fc.string(), fc.integer()),
        caseId: fc.oneof(fc.uuid(), fc.string()),
        canalId: fc.oneof(fc.uuid(), fc.constant(undefined), fc.integer()),
        type: fc.oneof(
          fc.constantFrom('case.opened', 'canal.added', 'spreader.placed', 'event.voided', 'nope'),
          fc.string(),
        ),
        at: fc.oneof(
          fc.date({ noInvalidDate: true }).map((d) => d.toISOString()),
          fc.string(),
        ),
        data: fc.oneof(
          fc.jsonValue(),
          fc.dictionary(fc.constantFrom('depthMm', 'size', 'setting', 'tooth', 'cwlMm', 'eventId'), fc.jsonValue()),
        ),
      },
      { requiredKeys: [] },
    );
    const body = fc.oneof(
      fc.jsonValue().map((v) => JSON.stringify(v)),
      fc.string(),
      fc
        .record({
          deviceId: fc.oneof(fc.string(), fc.jsonValue()),
          events: fc.oneof(fc.array(eventish, { maxLength: 8 }), fc.jsonValue()),
        })
        .map((v) => JSON.stringify(v)),
    );
    const type = fc.constantFrom(
      'application/json',
      'application/json; charset=utf-8',
      'text/plain',
      'application/x-www-form-urlencoded',
      '',
    );
    await fc.assert(
      fc.asyncProperty(body, type, async (b, t) => {
        const headers: Record<string, string> = t ? { 'Content-Type': t } : {};
        const res = await api.fetch('/api/sync', {
          method: 'POST',
          headers: { Origin: server.baseUrl, ...headers },
          body: b,
        });
        expect(ALLOWED.has(res.status), `status ${res.status} for ${b.slice(0, 200)}`).toBe(true);
        await res.arrayBuffer();
      }),
      { seed: SEED, numRuns: 400 },
    );
    const after = await k('events').count({ n: '*' }).first();
    expect(after).toEqual(before);
  }, 300_000);
});
