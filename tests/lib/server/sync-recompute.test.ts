// Which canals a batch recomputes, and with which events: only the canals it touched, each
// with its own events and the case-level ones (docs/sync-contract.md, "Rules and case-level events").
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import type { LogEvent } from '../../../src/lib/rules/index';
import { ingestBatch } from '../../../src/lib/server/sync';
import { EventWriter } from '../../helpers/events';
import { syncDb, type SyncDb } from '../../helpers/sync-db';

const seen = vi.hoisted(() => [] as { canalId: string; events: readonly LogEvent[] }[]);
vi.mock('../../../src/lib/rules/index', async (importOriginal) => {
  const rules = await importOriginal<typeof import('../../../src/lib/rules/index')>();
  return {
    ...rules,
    evaluateCanal: (canalId: string, events: readonly LogEvent[], tol?: Parameters<typeof rules.evaluateCanal>[2]) => {
      seen.push({ canalId, events });
      return rules.evaluateCanal(canalId, events, tol);
    },
  };
});
const { evaluateCanal } =
  await vi.importActual<typeof import('../../../src/lib/rules/index')>('../../../src/lib/rules/index');

let db: SyncDb;
beforeAll(async () => {
  db = await syncDb();
});
afterAll(async () => {
  await db.close();
});
beforeEach(() => {
  seen.length = 0;
});

/** A case with two canals half way through, stored; the writer goes on from there. */
async function twoCanals() {
  const w = new EventWriter();
  w.open();
  const mb = w.canal('MB', 20);
  const d = w.canal('D', 21);
  w.textbook(mb, 20, 3);
  w.add('seat.checked', { fileSize: '35', lengthMm: 21, result: 'seated' }, d);
  await ingestBatch(db.k, db.ana, 'tablet', w.events);
  seen.length = 0;
  return { w, mb, d };
}

const allOf = async (caseId: string) =>
  (
    (await db
      .k('events')
      .where({ case_id: caseId })
      .select('id', 'case_id', 'canal_id', 'type', 'at', 'data_json')) as {
      id: string;
      case_id: string;
      canal_id: string | null;
      type: string;
      at: string;
      data_json: string;
    }[]
  ).map(
    (r) =>
      ({
        id: r.id,
        caseId: r.case_id,
        ...(r.canal_id ? { canalId: r.canal_id } : {}),
        type: r.type,
        at: r.at,
        data: JSON.parse(r.data_json),
      }) as LogEvent,
  );

describe('ingestBatch, recomputing canals', () => {
  it("evaluates only the canal a batch touched, with that canal's and the case-level events", async () => {
    const { w, d } = await twoCanals();
    const { canals } = await ingestBatch(db.k, db.ana, 'tablet', [
      w.add('taper.checked', { spreader: 'MF', depthMm: 20 }, d),
    ]);
    expect(seen.map((s) => s.canalId)).toEqual([d]);
    expect(seen[0]!.events.every((e) => e.canalId === undefined || e.canalId === d)).toBe(true);
    expect(canals).toEqual([evaluateCanal(d, await allOf(w.caseId))]);
  });

  it('evaluates every canal of the case for a case-level event, each with its own events only', async () => {
    const { w, mb, d } = await twoCanals();
    const { canals } = await ingestBatch(db.k, db.ana, 'tablet', [w.add('access.restored', { kind: 'temporary' })]);
    expect(seen.map((s) => s.canalId).sort()).toEqual([mb, d].sort());
    for (const s of seen) expect(s.events.every((e) => e.canalId === undefined || e.canalId === s.canalId)).toBe(true);
    const all = await allOf(w.caseId);
    expect(canals).toEqual([mb, d].sort().map((id) => evaluateCanal(id, all)));
  });
});
