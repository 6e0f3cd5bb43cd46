// No answer of /api/sync may tell a student that someone else's case, canal or event id
// exists: each is answered, word for word, as an event for a case the server does not know.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { EventWriter, type WireEvent } from '../helpers/events';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let mira: ApiClient;
let tomas: ApiClient;

beforeAll(async () => {
  server = await startServer();
  [mira, tomas] = await Promise.all([
    apiSignIn(server.baseUrl, DEMO.mira, DEMO.password),
    apiSignIn(server.baseUrl, DEMO.tomas, DEMO.password),
  ]);
});
afterAll(async () => {
  await server?.stop();
});

/** The raw answer to a batch of events, as bytes on the wire. */
async function raw(api: ApiClient, events: unknown[]): Promise<string> {
  const res = await api.post('/api/sync', { deviceId: 'tablet-probe', events });
  expect(res.status).toBe(200);
  return res.text();
}

/** Mira's stored case with one canal and one step: the ids Tomas must learn nothing about. */
async function mirasCase() {
  const w = new EventWriter();
  const opened = w.open();
  const canalId = w.canal();
  const step = w.add('seat.checked', { fileSize: '35', lengthMm: 21, result: 'seated' }, canalId);
  expect(JSON.parse(await raw(mira, w.events)).results.every((r: { status: string }) => r.status === 'stored')).toBe(
    true,
  );
  return { caseId: w.caseId, canalId, opened, step };
}

/** Tomas's own stored case. */
async function tomasCase() {
  const w = new EventWriter();
  w.open();
  await raw(tomas, w.events);
  return w;
}

/** The same event for a case nobody has: the answer every probe must equal. */
const forUnknownCase = (e: WireEvent): WireEvent => ({ ...e, caseId: randomUUID() });

describe("POST /api/sync gives no hint of others' ids", () => {
  it("answers case.opened with another student's case id as for an unknown case", async () => {
    const theirs = await mirasCase();
    const probe: WireEvent = { ...new EventWriter().open(), caseId: theirs.caseId };
    const baseline = { ...new EventWriter().add('note.added', { text: 'probe' }), id: probe.id };
    const answer = await raw(tomas, [probe]);
    expect(answer).toBe(await raw(tomas, [baseline]));
    expect(JSON.parse(answer).results[0]).toMatchObject({ status: 'rejected', retry: true });
  });

  it("answers canal.added with a canal id of another student's case as for an unknown case", async () => {
    const theirs = await mirasCase();
    const own = await tomasCase();
    own.canal();
    const probe = { ...own.events.at(-1)!, canalId: theirs.canalId };
    const answer = await raw(tomas, [probe]);
    expect(answer).toBe(await raw(tomas, [forUnknownCase(probe)]));
  });

  it('answers an event whose id another student used as for an unknown case', async () => {
    const theirs = await mirasCase();
    const own = await tomasCase();
    const probe = { ...own.add('note.added', { text: 'probe' }), id: theirs.step.id };
    const baseline = forUnknownCase({ ...probe, id: randomUUID() });
    const answer = await raw(tomas, [probe]);
    expect(answer.replaceAll(probe.id, 'ID')).toBe((await raw(tomas, [baseline])).replaceAll(baseline.id, 'ID'));
  });

  it("answers an event for another student's case, sent again or new, as for an unknown case", async () => {
    const theirs = await mirasCase();
    const step = {
      ...new EventWriter().add('seat.checked', { fileSize: '35', lengthMm: 20, result: 'seated' }, theirs.canalId),
      caseId: theirs.caseId,
    };
    const answer = await raw(tomas, [step]);
    expect(answer).toBe(await raw(tomas, [forUnknownCase(step)]));
    const again = await raw(tomas, [theirs.opened]);
    expect(again).toBe(
      await raw(tomas, [
        forUnknownCase({ ...new EventWriter().add('note.added', { text: 'x' }), id: theirs.opened.id }),
      ]),
    );
  });

  it("answers a step naming another student's canal, and a withdrawal naming their event, as for ids not on the server", async () => {
    const theirs = await mirasCase();
    const own = await tomasCase();
    const canalId = own.canal();
    await raw(tomas, own.events.slice(-1));
    const step = own.add('taper.checked', { spreader: 'MF', depthMm: 20 }, theirs.canalId);
    const unknownCanal = { ...step, canalId: randomUUID() };
    expect(await raw(tomas, [step])).toBe(await raw(tomas, [unknownCanal]));
    const undo = own.add('event.voided', { eventId: theirs.step.id, reason: 'probe' }, canalId);
    const unknownTarget = { ...undo, data: { eventId: randomUUID(), reason: 'probe' } };
    expect(await raw(tomas, [undo])).toBe(await raw(tomas, [unknownTarget]));
  });

  it("keeps a student's own taken ids answered as before", async () => {
    const mine = await mirasCase();
    const again = JSON.parse(await raw(mira, [mine.opened, { ...mine.opened, id: randomUUID() }])).results;
    expect(again[0]).toEqual({ id: mine.opened.id, status: 'duplicate' });
    expect(again[1]).toMatchObject({ status: 'rejected', error: 'this case was already opened' });
    expect(again[1].retry).toBeUndefined();
    const other = new EventWriter();
    other.open();
    const canal = {
      ...other.add(
        'canal.added',
        { name: 'D', referencePoint: 'cusp', cwlMm: 21, mafSize: '35', preparation: 'step-back' },
        mine.canalId,
      ),
    };
    const reused = JSON.parse(await raw(mira, other.events)).results;
    expect(reused[1]).toMatchObject({ id: canal.id, status: 'rejected', error: 'this canal was already added' });
    const changed = JSON.parse(
      await raw(mira, [{ ...mine.step, data: { fileSize: '35', lengthMm: 20, result: 'seated' } }]),
    ).results[0];
    expect(changed.error).toMatch(/already used for a different event/);
  });
});
