import 'fake-indexeddb/auto';
import { randomUUID } from 'node:crypto';
import { IDBFactory } from 'fake-indexeddb';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { LIMITS, LIMIT_MESSAGES } from '../../../src/lib/rules/index';
import { closeDb } from '../../../src/lib/client/db';
import { listEvents } from '../../../src/lib/client/outbox';
import { useChairside } from '../../../src/lib/client/store';

const USER = 5;
const setUp = (name: string) => ({
  name,
  referencePoint: 'cusp tip',
  cwlMm: 21,
  mafSize: '35',
  preparation: 'step-back',
});

beforeEach(async () => {
  await closeDb();
  globalThis.indexedDB = new IDBFactory();
  vi.stubGlobal('navigator', { onLine: false });
  useChairside.setState({
    identity: {
      user: { id: USER, name: 'Ana', role: 'student' },
      source: 'tablet',
      signedOut: false,
      demo: false,
      serverContract: 1,
    },
    rows: [],
    caseId: null,
    error: null,
  });
});

/** Opens a case on the tablet and sets up `count` canals, as the island's cards do. */
async function caseWithCanals(count: number) {
  const { record } = useChairside.getState();
  const caseId = randomUUID();
  expect(await record('case.opened', { setting: 'block' }, { caseId, label: 'case opened' })).not.toBeNull();
  useChairside.getState().openCase(caseId);
  const canals: { canalId: string; addedId: string }[] = [];
  for (let i = 0; i < count; i++) {
    const canalId = randomUUID();
    const e = await record('canal.added', setUp(`C${i}`), { canalId, label: `canal C${i} set up` });
    expect(e, `canal ${i}`).not.toBeNull();
    canals.push({ canalId, addedId: e!.id });
  }
  return { caseId, canals };
}

describe('record', () => {
  it('records nothing of a type the server it last heard from does not know, and says why', async () => {
    const state = useChairside.getState();
    useChairside.setState({ identity: { ...state.identity, serverContract: 0 } });
    expect(
      await state.record('case.opened', { setting: 'block' }, { caseId: randomUUID(), label: 'case opened' }),
    ).toBeNull();
    expect(useChairside.getState().error).toMatch(/server does not know this step yet/);
    expect(await listEvents(USER)).toHaveLength(0);
  });

  it(`refuses a canal past ${LIMITS.canalsPerCase} with a plain message and writes nothing to the tablet`, async () => {
    const { record } = useChairside.getState();
    await caseWithCanals(LIMITS.canalsPerCase);
    const before = (await listEvents(USER)).length;
    expect(await record('canal.added', setUp('C9'), { canalId: randomUUID(), label: 'canal C9 set up' })).toBeNull();
    expect(useChairside.getState().error).toBe(`Not saved: ${LIMIT_MESSAGES.canalsPerCase}`);
    expect(await listEvents(USER)).toHaveLength(before);
  });

  it("takes a canal again once another canal's set-up is withdrawn", async () => {
    const { record } = useChairside.getState();
    const { canals } = await caseWithCanals(LIMITS.canalsPerCase);
    const first = canals[0]!;
    expect(
      await record(
        'event.voided',
        { eventId: first.addedId, reason: 'wrong tooth' },
        { canalId: first.canalId, label: 'withdrawn' },
      ),
    ).not.toBeNull();
    expect(
      await record('canal.added', setUp('C9'), { canalId: randomUUID(), label: 'canal C9 set up' }),
    ).not.toBeNull();
  });

  it(`refuses the event past ${LIMITS.eventsPerCanal} on one canal`, async () => {
    const { record } = useChairside.getState();
    const { canals } = await caseWithCanals(1);
    const canalId = canals[0]!.canalId;
    for (let i = 1; i < LIMITS.eventsPerCanal; i++) {
      expect(await record('note.added', { text: `n${i}` }, { canalId, label: 'note' })).not.toBeNull();
    }
    expect(await record('note.added', { text: 'one more' }, { canalId, label: 'note' })).toBeNull();
    expect(useChairside.getState().error).toBe(`Not saved: ${LIMIT_MESSAGES.eventsPerCanal}`);
    expect(await listEvents(USER)).toHaveLength(1 + LIMITS.eventsPerCanal);
  });

  it(`refuses the case-level event past ${LIMITS.caseLevelEventsPerCase}`, async () => {
    const { record } = useChairside.getState();
    await caseWithCanals(0);
    for (let i = 1; i < LIMITS.caseLevelEventsPerCase; i++) {
      expect(await record('note.added', { text: `n${i}` }, { label: 'note' })).not.toBeNull();
    }
    expect(await record('note.added', { text: 'one more' }, { label: 'note' })).toBeNull();
    expect(useChairside.getState().error).toBe(`Not saved: ${LIMIT_MESSAGES.caseLevelEventsPerCase}`);
  });
});
