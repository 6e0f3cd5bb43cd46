// A case opened by mistake (docs/lifecycle.md, "discard"): case.discarded through sync, the
// refusals, the lists it leaves, the audit line that keeps a chart number, and its undoing.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listCases } from '../../../src/lib/server/cases';
import { ingestBatch } from '../../../src/lib/server/sync';
import { EventWriter } from '../../helpers/events';
import { syncDb, type SyncDb } from '../../helpers/sync-db';

let db: SyncDb;
beforeAll(async () => {
  db = await syncDb();
});
afterAll(async () => {
  await db.close();
});

const ana = () => ({ id: db.ana, email: 'ana@test.example', name: 'Ana', role: 'student' as const });
const listed = async () => (await listCases(db.k, ana())).map((c) => c.caseId);
const discardedAt = async (caseId: string) =>
  ((await db.k('cases').where({ id: caseId }).first('discarded_at')) as { discarded_at: string | null }).discarded_at;

describe('case.discarded', () => {
  it('takes a case with no filled canal out of every list, and an audit line keeps its chart number', async () => {
    const w = new EventWriter();
    w.open('patient', 21);
    w.canal('Main', 23);
    await ingestBatch(db.k, db.ana, 'tablet', w.events);
    expect(await listed()).toContain(w.caseId);

    const discard = w.add('case.discarded', { reason: 'Opened for the wrong tooth' });
    const answer = await ingestBatch(db.k, db.ana, 'tablet', [discard]);
    expect(answer.results).toEqual([{ id: discard.id, status: 'stored' }]);
    expect(await discardedAt(w.caseId)).not.toBeNull();
    expect(await listed()).not.toContain(w.caseId);
    const line = await db.k('audit_log').where({ action: 'case.discard', subject_id: w.caseId }).first();
    expect(JSON.parse(line?.detail_json ?? 'null')).toEqual({
      chartRef: 'TST-0001',
      reason: 'Opened for the wrong tooth',
    });
    expect(line?.actor_id).toBe(db.ana);
  });

  it('refuses further steps on a discarded case, saying why, and stores nothing', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    w.add('case.discarded', { reason: 'Practice run' });
    await ingestBatch(db.k, db.ana, 'tablet', w.events);
    const step = w.add('seat.checked', { fileSize: '35', lengthMm: 21, result: 'seated' }, canal);
    const answer = await ingestBatch(db.k, db.ana, 'tablet', [step]);
    expect(answer.results[0]).toMatchObject({ status: 'rejected', error: expect.stringMatching(/discarded/) });
    expect(await db.k('events').where({ id: step.id })).toHaveLength(0);
  });

  it('is restored by voiding the discard, back in the lists and open', async () => {
    const w = new EventWriter();
    w.open();
    w.canal();
    const discard = w.add('case.discarded', { reason: 'Tapped by mistake' });
    await ingestBatch(db.k, db.ana, 'tablet', w.events);
    const undo = w.add('event.voided', { eventId: discard.id, reason: 'Undo' });
    const answer = await ingestBatch(db.k, db.ana, 'tablet', [undo]);
    expect(answer.results).toEqual([{ id: undo.id, status: 'stored' }]);
    expect(await discardedAt(w.caseId)).toBeNull();
    expect(await listed()).toContain(w.caseId);
    expect(await db.k('audit_log').where({ action: 'case.restore', subject_id: w.caseId })).toHaveLength(1);
  });

  it('refuses to discard a case with a seated master cone', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    w.add('master.fitted', { size: '35', lengthMm: 21, reachedLength: true }, canal);
    w.add('master.seated', { sealer: 'zoe' }, canal);
    await ingestBatch(db.k, db.ana, 'tablet', w.events);
    const discard = w.add('case.discarded', { reason: 'Wrong tooth' });
    const answer = await ingestBatch(db.k, db.ana, 'tablet', [discard]);
    expect(answer.results[0]).toMatchObject({ status: 'rejected', error: expect.stringMatching(/filled canal/) });
    expect(await discardedAt(w.caseId)).toBeNull();
  });

  it('refuses a discard sent in the same batch as a seated master cone', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal();
    w.add('master.fitted', { size: '35', lengthMm: 21, reachedLength: true }, canal);
    w.add('master.seated', { sealer: 'zoe' }, canal);
    const discard = w.add('case.discarded', { reason: 'Wrong tooth' });
    const answer = await ingestBatch(db.k, db.ana, 'tablet', w.events);
    expect(answer.results.find((r) => r.id === discard.id)).toMatchObject({ status: 'rejected' });
  });

  it('refuses to discard a case waiting for review', async () => {
    const w = new EventWriter();
    w.open();
    w.canal();
    w.add('case.submitted', {});
    await ingestBatch(db.k, db.ana, 'tablet', w.events);
    const discard = w.add('case.discarded', { reason: 'Wrong tooth' });
    const answer = await ingestBatch(db.k, db.ana, 'tablet', [discard]);
    expect(answer.results[0]).toMatchObject({ error: expect.stringMatching(/withdraw the submission/) });
  });

  it('refuses a discard with no reason (the contract asks for one)', async () => {
    const w = new EventWriter();
    w.open();
    const bad = w.add('case.discarded', { reason: '  ' });
    const answer = await ingestBatch(db.k, db.ana, 'tablet', w.events);
    expect(answer.results.find((r) => r.id === bad.id)).toMatchObject({ status: 'rejected' });
  });
});
