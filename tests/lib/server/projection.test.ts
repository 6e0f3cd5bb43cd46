// The projection: the derived rows it writes, the finding history it keeps by diffing the
// open findings before and after each judging, and the versions it stamps on each canal.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { RULES_VERSION } from '../../../src/lib/rules/index';
import type { FindingHistoryRow } from '../../../src/lib/server/tables';
import { writeSettings } from '../../../src/lib/server/settings';
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

const history = async (canalId: string, code?: string) =>
  (await db
    .k('finding_history')
    .where({ canal_id: canalId, ...(code ? { code } : {}) })
    .orderBy('id')) as FindingHistoryRow[];

describe('projectCanals, through a sync batch', () => {
  it('opens a history row when a finding is raised and closes it when the finding clears', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal('D', 21);
    const deep = w.add('spreader.placed', { spreader: 'MF', depthMm: 22 }, canal);
    await ingestBatch(db.k, db.ana, 'tablet', w.events);
    const raised = await history(canal, 'spreader-beyond-cwl');
    expect(raised).toHaveLength(1);
    expect(raised[0]).toMatchObject({ event_id: deep.id, cleared_at: null });

    await ingestBatch(db.k, db.ana, 'tablet', [
      w.add('event.voided', { eventId: deep.id, reason: 'misread the ruler' }, canal),
    ]);
    const cleared = await history(canal, 'spreader-beyond-cwl');
    expect(cleared).toHaveLength(1);
    expect(cleared[0]!.cleared_at).not.toBeNull();
    expect(await db.k('findings').where({ canal_id: canal, code: 'spreader-beyond-cwl' })).toHaveLength(0);
  });

  it('counts a check each time it fires, and leaves a finding that stays open alone', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal('D', 21);
    w.add('spreader.placed', { spreader: 'MF', depthMm: 22 }, canal);
    await ingestBatch(db.k, db.ana, 'tablet', w.events);
    const first = await history(canal);
    await ingestBatch(db.k, db.ana, 'tablet', [w.add('spreader.placed', { spreader: 'MF', depthMm: 23 }, canal)]);
    const after = await history(canal, 'spreader-beyond-cwl');
    expect(after).toHaveLength(2);
    // The first raising keeps its row and its date.
    expect(after[0]).toEqual(first.find((h) => h.code === 'spreader-beyond-cwl'));
    const open = (await history(canal)).filter((h) => h.cleared_at === null).map((h) => h.code);
    const findings = (await db.k('findings').where({ canal_id: canal }).pluck('code')) as string[];
    expect(open.sort()).toEqual(findings.sort());
  });

  it('stamps each canal with the rules version and settings version that judged it', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal('D', 21);
    await ingestBatch(db.k, db.ana, 'tablet', w.events);
    const before = await db.k('canals').where({ id: canal }).first('rules_version', 'settings_version');
    expect(before).toEqual({ rules_version: RULES_VERSION, settings_version: expect.any(Number) });
    const { version } = await writeSettings(db.k, null, { firstSpreaderMarginMm: 2.5 });
    await ingestBatch(db.k, db.ana, 'tablet', [w.add('note.added', { text: 'moved on' }, canal)]);
    expect(await db.k('canals').where({ id: canal }).first('settings_version')).toEqual({ settings_version: version });
    await writeSettings(db.k, null, { firstSpreaderMarginMm: 2 });
  });

  it('clears every open finding of a canal whose set-up is withdrawn', async () => {
    const w = new EventWriter();
    w.open();
    const canal = w.canal('D', 21);
    w.add('spreader.placed', { spreader: 'MF', depthMm: 22 }, canal);
    await ingestBatch(db.k, db.ana, 'tablet', w.events);
    const setUp = w.events.find((e) => e.type === 'canal.added')!;
    await ingestBatch(db.k, db.ana, 'tablet', [
      w.add('event.voided', { eventId: setUp.id, reason: 'no canal' }, canal),
    ]);
    expect((await history(canal)).every((h) => h.cleared_at !== null)).toBe(true);
    expect(await db.k('findings').where({ canal_id: canal })).toHaveLength(0);
  });
});
