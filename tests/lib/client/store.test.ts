import 'fake-indexeddb/auto';
import { randomUUID } from 'node:crypto';
import { IDBFactory } from 'fake-indexeddb';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { LIMITS, LIMIT_MESSAGES } from '../../../src/lib/rules/index';
import { closeDb } from '../../../src/lib/client/db';
import { listEvents } from '../../../src/lib/client/outbox';
import { useChairside } from '../../../src/lib/client/store';
import { TAP_GUARD_MS } from '../../../src/lib/client/tapGuard';

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

describe('record, for a gloved double tap', () => {
  it(`records the same answer tapped twice within ${TAP_GUARD_MS} ms once`, async () => {
    const { record } = useChairside.getState();
    const { canals } = await caseWithCanals(1);
    const canalId = canals[0]!.canalId;
    const seat = { fileSize: '35', lengthMm: 21, result: 'seated' } as const;
    const before = (await listEvents(USER)).length;
    // The second tap arrives before the first is saved, as an instant double tap does.
    const [first, second] = await Promise.all([
      record('seat.checked', seat, { canalId, label: 'seat check' }),
      record('seat.checked', seat, { canalId, label: 'seat check' }),
    ]);
    expect(first).not.toBeNull();
    expect(second).toBeNull();
    expect(useChairside.getState().error).toBeNull();
    expect(await listEvents(USER)).toHaveLength(before + 1);
  });

  it('records a different answer at once, and the same answer again once the window has passed', async () => {
    const { record } = useChairside.getState();
    const { canals } = await caseWithCanals(1);
    const canalId = canals[0]!.canalId;
    const clock = vi.spyOn(performance, 'now');
    try {
      clock.mockReturnValue(10_000);
      const taper = (depthMm: number) =>
        record('taper.checked', { spreader: 'MF', depthMm }, { canalId, label: 'taper check' });
      expect(await taper(19.5)).not.toBeNull();
      expect(await taper(19)).not.toBeNull();
      clock.mockReturnValue(10_000 + TAP_GUARD_MS - 1);
      expect(await taper(19)).toBeNull();
      clock.mockReturnValue(10_000 + TAP_GUARD_MS);
      expect(await taper(19)).not.toBeNull();
    } finally {
      clock.mockRestore();
    }
  });
});

describe('the value just entered', () => {
  /** A seat check, then a taper check shown big; resolves to the canal and the seat check's id. */
  async function entered() {
    const { record } = useChairside.getState();
    const { canals } = await caseWithCanals(1);
    const canalId = canals[0]!.canalId;
    const seat = await record(
      'seat.checked',
      { fileSize: '35', lengthMm: 21, result: 'seated' },
      { canalId, label: 'seat check', value: 'Seats and holds' },
    );
    const taper = await record(
      'taper.checked',
      { spreader: 'MF', depthMm: 19.5 },
      { canalId, label: 'taper check', value: '19.5 mm' },
    );
    expect(useChairside.getState().last).toMatchObject({ eventId: taper!.id, value: '19.5 mm' });
    return { canalId, seatId: seat!.id };
  }

  it('clears when any answer is withdrawn, not only the one it shows', async () => {
    const { canalId, seatId } = await entered();
    await useChairside
      .getState()
      .record(
        'event.voided',
        { eventId: seatId, reason: 'Withdrawn from the timeline' },
        { canalId, label: 'withdrawn' },
      );
    expect(useChairside.getState().last).toBeNull();
  });

  it('clears when compaction is finished', async () => {
    const { canalId } = await entered();
    useChairside.getState().setFinished(canalId, true);
    expect(useChairside.getState().last).toBeNull();
  });
});
