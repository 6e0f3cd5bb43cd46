import { randomUUID } from 'node:crypto';
import knexFactory, { type Knex } from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import { anonymous, apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { EventWriter } from '../helpers/events';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let mira: ApiClient;
let tomas: ApiClient;
let k: Knex;

beforeAll(async () => {
  server = await startServer();
  [mira, tomas] = await Promise.all([
    apiSignIn(server.baseUrl, DEMO.mira, DEMO.password),
    apiSignIn(server.baseUrl, DEMO.tomas, DEMO.password),
  ]);
  k = knexFactory(sqliteOptions(server.dbFile));
});
afterAll(async () => {
  await k?.destroy();
  await server?.stop();
});

interface Answer {
  results: { id: string | null; status: string; error?: string; retry?: boolean }[];
  canals: {
    canalId: string;
    caseId: string;
    state: { status: string; cwlMm: number; accessoryCones: number; complete: boolean };
    findings: { code: string; severity: string; eventId?: string; message: string }[];
  }[];
}

async function sync(
  api: ApiClient,
  events: unknown[],
  deviceId = 'tablet-test',
): Promise<{ status: number; body: Answer }> {
  const res = await api.post('/api/sync', { deviceId, events });
  return { status: res.status, body: (await res.json()) as Answer };
}

const count = async (caseId: string) =>
  Number(((await k('events').where({ case_id: caseId }).count({ n: '*' })) as { n: number }[])[0]!.n);

describe('POST /api/sync', () => {
  it('stores a new case, its canal and its steps, and answers the canal recomputed', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal('D', 21);
    w.textbook(canal, 21, 4);
    const { status, body } = await sync(mira, w.events);
    expect(status).toBe(200);
    expect(body.results.map((r) => r.status)).toEqual(w.events.map(() => 'stored'));
    expect(body.results.map((r) => r.id)).toEqual(w.events.map((e) => e.id));
    expect(body.canals).toHaveLength(1);
    expect(body.canals[0]).toMatchObject({
      canalId: canal,
      caseId: w.caseId,
      state: { cwlMm: 21, accessoryCones: 4, complete: true },
    });
    expect(body.canals[0]!.findings.filter((f) => f.severity !== 'note')).toEqual([]);
    expect(await count(w.caseId)).toBe(w.events.length);
  });

  it('stores nothing twice when the same batch is sent again, answering duplicate', async () => {
    const w = new EventWriter();
    w.open('block');
    w.textbook(w.canal('Main', 18), 18, 3);
    await sync(mira, w.events);
    const again = await sync(mira, w.events);
    expect(again.body.results.every((r) => r.status === 'duplicate')).toBe(true);
    expect(await count(w.caseId)).toBe(w.events.length);
  });

  it('treats 35 and "35" and reordered keys as the same content', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    const fit = w.add('master.fitted', { size: '35', lengthMm: 21, reachedLength: true }, canal);
    await sync(mira, w.events);
    const resend = {
      data: { reachedLength: true, lengthMm: 21, size: 35 },
      at: fit.at,
      type: fit.type,
      canalId: canal,
      caseId: w.caseId,
      id: fit.id,
    };
    const { body } = await sync(mira, [resend]);
    expect(body.results).toEqual([{ id: fit.id, status: 'duplicate' }]);
  });

  it('rejects an id used again with other content, and keeps the first', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    const e = w.add('spreader.placed', { spreader: 'MF', depthMm: 19 }, canal);
    await sync(mira, w.events);
    const { body } = await sync(mira, [{ ...e, data: { spreader: 'MF', depthMm: 17 } }]);
    expect(body.results[0]).toMatchObject({ id: e.id, status: 'rejected' });
    expect(body.results[0]!.error).toMatch(/already used for a different event/);
    const row = await k('events').where({ id: e.id }).first();
    expect(JSON.parse(row!.data_json).depthMm).toBe(19);
  });

  it('keeps the good events of a mixed batch and says why each bad one was refused', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    const good = w.add('spreader.placed', { spreader: 'MF', depthMm: 19 }, canal);
    const offStep = { ...w.add('spreader.placed', { spreader: 'MF', depthMm: 17.3 }, canal) };
    const badSize = { ...w.add('accessory.placed', { size: '33', lengthMm: 17, reachedLength: true }, canal) };
    const { body } = await sync(mira, w.events);
    const byId = new Map(body.results.map((r) => [r.id, r]));
    expect(byId.get(good.id)!.status).toBe('stored');
    expect(byId.get(offStep.id)).toMatchObject({ status: 'rejected' });
    expect(byId.get(offStep.id)!.error).toMatch(/depthMm.*0\.5/);
    expect(byId.get(badSize.id)!.error).toMatch(/size/);
    expect(await count(w.caseId)).toBe(w.events.length - 2);
  });

  it('creates cases and canals from their events in whatever order they arrive in one batch', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    w.add('seat.checked', { fileSize: '35', lengthMm: 21, result: 'seated' }, canal);
    const { body } = await sync(mira, [...w.events].reverse());
    expect(body.results.every((r) => r.status === 'stored')).toBe(true);
  });

  it('asks for a later retry when the case or canal is not on the server yet', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    const step = w.add('seat.checked', { fileSize: '35', lengthMm: 21, result: 'seated' }, canal);
    const { body } = await sync(mira, [step]);
    expect(body.results[0]).toMatchObject({ id: step.id, status: 'rejected', retry: true });
    const later = await sync(mira, w.events);
    expect(later.body.results.every((r) => r.status === 'stored')).toBe(true);
  });

  it('lists every canal of the case when a case-level event touches them all', async () => {
    const w = new EventWriter();
    w.open();
    const a = w.canal('MB');
    const b = w.canal('ML');
    await sync(mira, w.events);
    const restored = w.add('access.restored', { kind: 'temporary' });
    const { body } = await sync(mira, [restored]);
    expect(body.canals.map((c) => c.canalId).sort()).toEqual([a, b].sort());
  });

  it("refuses to write into another student's case, as if it did not exist", async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    await sync(mira, w.events);
    const intruder = w.add('seat.checked', { fileSize: '35', lengthMm: 21, result: 'seated' }, canal);
    const { body } = await sync(tomas, [intruder]);
    expect(body.results[0]).toMatchObject({ status: 'rejected', retry: true });
    expect(body.results[0]!.error).toMatch(/not on the server yet/);
    expect(await count(w.caseId)).toBe(2);
  });

  it('refuses new events for a signed-off case until it is reopened', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    await sync(mira, w.events);
    await k('cases').where({ id: w.caseId }).update({ review_status: 'approved' });
    const late = w.add('note.added', { text: 'one more thing' }, canal);
    const { body } = await sync(mira, [late]);
    expect(body.results[0]!.error).toMatch(/signed off/);
    await k('cases').where({ id: w.caseId }).update({ review_status: 'returned' });
    expect((await sync(mira, [late])).body.results[0]!.status).toBe('stored');
  });

  it('marks the case submitted on case.submitted', async () => {
    const w = new EventWriter();
    w.open('block');
    w.textbook(w.canal('Main', 18), 18, 3);
    w.add('access.restored', { kind: 'temporary' });
    w.add('case.submitted');
    await sync(mira, w.events);
    const row = await k('cases').where({ id: w.caseId }).first();
    expect(row!.review_status).toBe('submitted');
  });

  it('records who sent each event and from which device', async () => {
    const w = new EventWriter();
    w.open();
    await sync(mira, w.events, 'tablet-7');
    const row = await k('events')
      .join('users', 'users.id', 'events.user_id')
      .where('events.id', w.events[0]!.id)
      .first('users.email', 'events.device_id');
    expect(row).toEqual({ email: DEMO.mira, device_id: 'tablet-7' });
  });
});

describe('POST /api/sync, edge cases', () => {
  it('stores a canal with more findings than SQLite takes in one insert', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal('D', 18);
    // 260 placements beyond the CWL before any seating: two findings each.
    for (let i = 0; i < 260; i++) w.add('spreader.placed', { spreader: 'MF', depthMm: 19 }, canal);
    const { status, body } = await sync(mira, w.events);
    expect(status).toBe(200);
    expect(body.results.every((r) => r.status === 'stored')).toBe(true);
    expect(body.canals[0]!.findings.length).toBeGreaterThan(500);
  });

  it("refuses a batch whose outbox belongs to another account than the session's", async () => {
    const w = new EventWriter();
    w.open();
    const me = (await (await mira.fetch('/api/me')).json()) as { id: number };
    const wrong = await mira.post('/api/sync', { deviceId: 'tablet-test', userId: me.id + 1000, events: w.events });
    expect(wrong.status).toBe(403);
    expect(await wrong.json()).toMatchObject({ code: 'other-user' });
    expect(await count(w.caseId)).toBe(0);
    const right = await mira.post('/api/sync', { deviceId: 'tablet-test', userId: me.id, events: w.events });
    expect(right.status).toBe(200);
    expect(await count(w.caseId)).toBe(1);
  });

  it('takes a case out of the review queue when its submission is withdrawn', async () => {
    const w = new EventWriter();
    w.open('block');
    w.textbook(w.canal('Main', 18), 18, 3);
    const submitted = w.add('case.submitted');
    await sync(mira, w.events);
    expect((await k('cases').where({ id: w.caseId }).first())!.review_status).toBe('submitted');
    const undo = w.add('event.voided', { eventId: submitted.id, reason: 'tapped by mistake' });
    const { body } = await sync(mira, [undo]);
    expect(body.results[0]!.status).toBe('stored');
    const row = await k('cases').where({ id: w.caseId }).first();
    expect(row!.review_status).toBe('open');
    expect(row!.submitted_at).toBeNull();
    expect(body.canals[0]!.state.status).not.toBe('submitted');
  });

  it('leaves a case out of the queue when its submission and the withdrawal come in one batch', async () => {
    const w = new EventWriter();
    w.open('block');
    w.textbook(w.canal('Main', 18), 18, 3);
    const submitted = w.add('case.submitted');
    w.add('event.voided', { eventId: submitted.id, reason: 'tapped by mistake' });
    await sync(mira, w.events);
    expect((await k('cases').where({ id: w.caseId }).first())!.review_status).toBe('open');
  });

  it("answers a returned case's canals with the same status in the sync answer as on reading", async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    await sync(mira, w.events);
    await k('cases').where({ id: w.caseId }).update({ review_status: 'returned' });
    const { body } = await sync(mira, [w.add('note.added', { text: 'redone as asked' }, canal)]);
    const read = await (await mira.fetch(`/api/canals/${canal}`)).json();
    expect(body.canals[0]!.state.status).toBe('returned');
    expect(body.canals[0]).toEqual(read);
  });

  it("rejects another student's event sent again, rather than calling it a duplicate or saying whose it is", async () => {
    const w = new EventWriter();
    w.open();
    await sync(mira, w.events);
    const { body } = await sync(tomas, w.events);
    expect(body.results[0]).toMatchObject({
      status: 'rejected',
      error: 'the case of this event is not on the server yet; it will be sent again',
      retry: true,
    });
  });

  it('rejects a withdrawal that names an event outside its own canal', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    const restored = w.add('access.restored', { kind: 'temporary' });
    const wrongScope = w.add('event.voided', { eventId: restored.id, reason: 'wrong' }, canal);
    const { body } = await sync(mira, w.events);
    const r = body.results.find((x) => x.id === wrongScope.id)!;
    expect(r.status).toBe('rejected');
    expect(r.retry).toBeUndefined();
  });

  it('asks again later for a withdrawal whose target must itself be sent again', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    const step = w.add('seat.checked', { fileSize: '35', lengthMm: 21, result: 'seated' }, canal);
    const undo = w.add('event.voided', { eventId: step.id, reason: 'tapped by mistake' }, canal);
    const first = await sync(mira, [step, undo]);
    expect(first.body.results.map((r) => r.retry)).toEqual([true, true]);
    const again = await sync(mira, w.events);
    expect(again.body.results.every((r) => r.status === 'stored')).toBe(true);
  });

  it('rejects for good a withdrawal whose target was refused in the same batch', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    const bad = w.add('spreader.placed', { spreader: 'MF', depthMm: 99 }, canal);
    const undo = w.add('event.voided', { eventId: bad.id, reason: 'typo' }, canal);
    const { body } = await sync(mira, [undo, ...w.events.slice(0, -1)]);
    const r = body.results.find((x) => x.id === undo.id)!;
    expect(r).toMatchObject({ status: 'rejected' });
    expect(r.retry).toBeUndefined();
  });
});

describe('POST /api/sync answers', () => {
  const batch = () => ({ deviceId: 'x', events: [] as unknown[] });

  it('401 when not signed in', async () => {
    expect((await anonymous(server.baseUrl).post('/api/sync', batch())).status).toBe(401);
  });
  it('403 to an attending or a director', async () => {
    for (const who of [DEMO.helen, DEMO.ingrid]) {
      const api = await apiSignIn(server.baseUrl, who, DEMO.password);
      expect((await api.post('/api/sync', batch())).status).toBe(403);
    }
  });
  it('403 when the Origin is another site or missing', async () => {
    expect((await mira.post('/api/sync', batch(), { headers: { Origin: 'https://elsewhere.example' } })).status).toBe(
      403,
    );
    const noOrigin = await mira.fetch('/api/sync', {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify(batch()),
    });
    expect(noOrigin.status).toBe(403);
  });
  it('415 when the body is not JSON', async () => {
    expect(
      (await mira.post('/api/sync', JSON.stringify(batch()), { headers: { 'Content-Type': 'text/plain' } })).status,
    ).toBe(415);
  });
  it('413 over 500 events or over 1 MB, storing nothing', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    for (let i = 0; i < 500; i++) w.add('note.added', { text: `n${i}` }, canal);
    expect(w.events.length).toBe(502);
    expect((await mira.post('/api/sync', { deviceId: 'x', events: w.events })).status).toBe(413);
    const big = { deviceId: 'x', events: [{ ...w.events[0], pad: 'x'.repeat(1024 * 1024) }] };
    expect((await mira.post('/api/sync', big)).status).toBe(413);
    expect(await count(w.caseId)).toBe(0);
  });
  it('400 with a message for malformed JSON or the wrong shape', async () => {
    const bad = await mira.post('/api/sync', '{"deviceId": "x", events: [');
    expect(bad.status).toBe(400);
    expect((await bad.json()).error).toMatch(/not valid JSON/);
    for (const body of [[], { events: [] }, { deviceId: 'x' }, { deviceId: 'x', events: {} }, 'null', '42']) {
      const res = await mira.post('/api/sync', body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(typeof (await res.json()).error).toBe('string');
    }
  });
});

describe('GET /api/canals/{canalId}', () => {
  let canalId: string;
  beforeAll(async () => {
    const w = new EventWriter();
    w.open();
    canalId = w.canal('D', 20);
    w.textbook(canalId, 20, 3);
    await sync(mira, w.events);
  });

  it('answers the owner, the assigned attending and a director with the same canal object', async () => {
    const own = await (await mira.fetch(`/api/canals/${canalId}`)).json();
    expect(own).toMatchObject({ canalId, state: { cwlMm: 20, accessoryCones: 3 } });
    const helen = await apiSignIn(server.baseUrl, DEMO.helen, DEMO.password);
    const ingrid = await apiSignIn(server.baseUrl, DEMO.ingrid, DEMO.password);
    expect(await (await helen.fetch(`/api/canals/${canalId}`)).json()).toEqual(own);
    expect(await (await ingrid.fetch(`/api/canals/${canalId}`)).json()).toEqual(own);
  });

  it('answers 404 to another student and to an attending not assigned, as for a canal that does not exist', async () => {
    const samuel = await apiSignIn(server.baseUrl, DEMO.samuel, DEMO.password);
    for (const api of [tomas, samuel]) {
      const res = await api.fetch(`/api/canals/${canalId}`);
      expect(res.status).toBe(404);
      expect(await res.json()).toEqual({ error: 'No such canal.' });
    }
    expect((await mira.fetch(`/api/canals/${randomUUID()}`)).status).toBe(404);
    expect((await mira.fetch('/api/canals/not-a-uuid')).status).toBe(404);
  });

  it('answers 401 when not signed in', async () => {
    expect((await anonymous(server.baseUrl).fetch(`/api/canals/${canalId}`)).status).toBe(401);
  });
});
