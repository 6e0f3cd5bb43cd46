// The limits of docs/sync-contract.md on the built server: past one, an event is rejected for
// good (no retry) with a reason the student can act on.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LIMITS, LIMIT_MESSAGES } from '../../src/lib/rules/index';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { EventWriter, type WireEvent } from '../helpers/events';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let priya: ApiClient;

beforeAll(async () => {
  server = await startServer();
  priya = await apiSignIn(server.baseUrl, DEMO.priya, DEMO.password);
});
afterAll(async () => {
  await server?.stop();
});

interface Result {
  id: string;
  status: string;
  error?: string;
  retry?: boolean;
}

async function sync(events: WireEvent[]): Promise<Map<string, Result>> {
  const res = await priya.post('/api/sync', { deviceId: 'tablet-limits', events });
  expect(res.status).toBe(200);
  const body = (await res.json()) as { results: Result[] };
  return new Map(body.results.map((r) => [r.id, r]));
}

const refusedFor = (limit: keyof typeof LIMIT_MESSAGES) => ({ status: 'rejected', error: LIMIT_MESSAGES[limit] });

describe('POST /api/sync, limits', () => {
  it(`rejects a canal past ${LIMITS.canalsPerCase} for good, and takes one once a set-up is withdrawn`, async () => {
    const w = new EventWriter();
    w.open();
    const canals = Array.from({ length: LIMITS.canalsPerCase }, (_, i) => w.canal(`C${i}`));
    expect([...(await sync(w.events)).values()].every((r) => r.status === 'stored')).toBe(true);
    w.canal('C9');
    const ninth = w.events.at(-1)!;
    const answer = (await sync([ninth])).get(ninth.id)!;
    expect(answer).toEqual({ id: ninth.id, ...refusedFor('canalsPerCase') });
    const setUp = w.events.find((e) => e.type === 'canal.added' && e.canalId === canals[3])!;
    const undo = w.add('event.voided', { eventId: setUp.id, reason: 'no such canal' }, canals[3]);
    const again = { ...ninth, id: crypto.randomUUID() };
    const later = await sync([undo, again]);
    expect(later.get(undo.id)!.status).toBe('stored');
    expect(later.get(again.id)!.status).toBe('stored');
  });

  it('takes in one batch what the tablet recorded offline: eight canals, one withdrawn, a ninth with its steps', async () => {
    const w = new EventWriter();
    w.open();
    const canals = Array.from({ length: LIMITS.canalsPerCase }, (_, i) => w.canal(`C${i}`));
    const setUp = w.events.find((e) => e.type === 'canal.added' && e.canalId === canals[0])!;
    w.add('event.voided', { eventId: setUp.id, reason: 'tapped the wrong tooth' }, canals[0]);
    const ninth = w.canal('C9');
    w.add('seat.checked', { fileSize: '35', lengthMm: 21, result: 'seated' }, ninth);
    const answers = await sync(w.events);
    expect([...answers.values()].filter((r) => r.status !== 'stored')).toEqual([]);
  });

  it(`rejects the event past ${LIMITS.eventsPerCanal} on one canal, withdrawals counted`, async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    const note = w.add('note.added', { text: 'first' }, canal);
    w.add('event.voided', { eventId: note.id, reason: 'typo' }, canal);
    while (w.events.length < 1 + LIMITS.eventsPerCanal) w.add('note.added', { text: `n${w.events.length}` }, canal);
    expect([...(await sync(w.events)).values()].every((r) => r.status === 'stored')).toBe(true);
    const extra = w.add('note.added', { text: 'one too many' }, canal);
    expect((await sync([extra])).get(extra.id)).toEqual({ id: extra.id, ...refusedFor('eventsPerCanal') });
  });

  it('keeps the events of a batch up to a limit and rejects the rest', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    while (w.events.length < 1 + LIMITS.eventsPerCanal + 3) w.add('note.added', { text: `n${w.events.length}` }, canal);
    const answers = await sync(w.events);
    for (const e of w.events.slice(-3))
      expect(answers.get(e.id)).toEqual({ id: e.id, ...refusedFor('eventsPerCanal') });
    expect([...answers.values()].filter((r) => r.status === 'stored')).toHaveLength(1 + LIMITS.eventsPerCanal);
  });

  it(`rejects the case-level event past ${LIMITS.caseLevelEventsPerCase}`, async () => {
    const w = new EventWriter();
    w.open();
    while (w.events.length < LIMITS.caseLevelEventsPerCase) w.add('note.added', { text: `n${w.events.length}` });
    expect([...(await sync(w.events)).values()].every((r) => r.status === 'stored')).toBe(true);
    const extra = w.add('note.added', { text: 'one too many' });
    expect((await sync([extra])).get(extra.id)).toEqual({ id: extra.id, ...refusedFor('caseLevelEventsPerCase') });
  });
});
