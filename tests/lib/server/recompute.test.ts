// The background re-judging after a settings change: unlocked canals take the new tolerance,
// an approved case keeps its verdict, the cursor survives an interruption, and sync batches
// go in between its transactions.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { recomputeStep, startRecompute } from '../../../src/lib/server/recompute';
import { changeSettings, SettingsError } from '../../../src/lib/server/settings-service';
import { readSettings, writeSettings } from '../../../src/lib/server/settings';
import { ingestBatch } from '../../../src/lib/server/sync';
import { EventWriter } from '../../helpers/events';
import { syncDb, type SyncDb } from '../../helpers/sync-db';

let db: SyncDb;
const director = { id: 0, role: 'director' as const };

beforeAll(async () => {
  db = await syncDb();
  const [row] = await db
    .k('users')
    .insert({ email: 'dir@test.example', name: 'Dir', role: 'director' })
    .returning('id');
  director.id = (row as { id: number }).id;
});
afterAll(async () => {
  await db.close();
});
beforeEach(async () => {
  // Each test starts from caught-up canals under the default tolerances.
  await writeSettings(db.k, null, { minAccessoryCones: 3 });
  await startRecompute(db.k);
});

/** A finished canal on a tooth with three kept accessory cones (no few-accessory-cones note at 3). */
async function finishedCase(): Promise<{ caseId: string; canal: string }> {
  const w = new EventWriter();
  w.open();
  const canal = w.canal('D', 21);
  w.textbook(canal, 21, 3);
  await ingestBatch(db.k, db.ana, 'tablet', w.events);
  return { caseId: w.caseId, canal };
}

const codes = async (canalId: string) =>
  (await db.k('findings').where({ canal_id: canalId }).pluck('code')) as string[];

describe('changeSettings and the re-judging it starts', () => {
  it('judges unlocked canals with the new tolerance and leaves an approved case alone', async () => {
    const open = await finishedCase();
    const signed = await finishedCase();
    await db.k('cases').where({ id: signed.caseId }).update({ review_status: 'approved' });
    expect(await codes(open.canal)).not.toContain('few-accessory-cones');
    const before = await db.k('canals').where({ id: signed.canal }).first();

    const changed = await changeSettings(db.k, director, { minAccessoryCones: 5 });
    await startRecompute(db.k); // waits for the run the change started

    expect(await codes(open.canal)).toContain('few-accessory-cones');
    expect(await db.k('canals').where({ id: open.canal }).first('settings_version')).toEqual({
      settings_version: changed.version,
    });
    expect(await codes(signed.canal)).not.toContain('few-accessory-cones');
    expect(await db.k('canals').where({ id: signed.canal }).first()).toEqual(before);
    const line = await db.k('audit_log').where({ action: 'settings.change' }).orderBy('id', 'desc').first();
    expect(JSON.parse(line!.detail_json!)).toEqual({
      fromVersion: changed.version - 1,
      changes: { minAccessoryCones: { from: 3, to: 5 } },
    });
  });

  it('refuses a value out of range, or a change by anyone but a director, storing nothing', async () => {
    const { version } = await readSettings(db.k);
    await expect(changeSettings(db.k, director, { minAccessoryCones: 40 })).rejects.toThrow(SettingsError);
    await expect(changeSettings(db.k, director, { noSuchThing: 1 })).rejects.toThrow(/not a setting/);
    await expect(changeSettings(db.k, { id: db.ana, role: 'student' }, { minAccessoryCones: 4 })).rejects.toThrow(
      /director/,
    );
    expect((await readSettings(db.k)).version).toBe(version);
  });

  it('goes on from its cursor after an interruption, judging no canal twice', async () => {
    for (let i = 0; i < 3; i++) await finishedCase();
    await writeSettings(db.k, null, { minAccessoryCones: 4 });
    const first = await recomputeStep(db.k, 2); // then the server stops
    const job = await db.k('recompute_jobs').first('cursor', 'finished_at');
    expect(job).toEqual({ cursor: first!.at(-1), finished_at: null });

    const rest: string[] = [];
    await startRecompute(db.k, { chunkSize: 2, onChunk: (ids) => void rest.push(...ids) });
    expect(rest.length).toBeGreaterThan(0);
    expect(rest.filter((id) => first!.includes(id))).toEqual([]);
    expect([...rest].sort()[0]! > first!.at(-1)!).toBe(true);
    const stale = await db
      .k('canals')
      .join('cases', 'cases.id', 'canals.case_id')
      .whereNot('cases.review_status', 'approved')
      .whereNot('canals.settings_version', (await readSettings(db.k)).version);
    expect(stale).toEqual([]);
  });

  it('lets a sync batch in between its transactions', async () => {
    for (let i = 0; i < 5; i++) await finishedCase();
    const w = new EventWriter();
    w.open();
    const canal = w.canal('D', 21);
    await writeSettings(db.k, null, { minAccessoryCones: 4 });
    const order: string[] = [];
    let sync: Promise<unknown> | undefined;
    await startRecompute(db.k, {
      chunkSize: 1,
      onChunk: () => {
        order.push('chunk');
        sync ??= ingestBatch(db.k, db.ana, 'tablet', w.events).then(() => order.push('sync'));
      },
    });
    await sync;
    const chunks = order.filter((o) => o === 'chunk').length;
    expect(chunks).toBeGreaterThanOrEqual(5);
    // The batch waited for at most the transaction that was running when it came, not the run.
    expect(order.indexOf('sync')).toBeLessThan(4);
    expect(await db.k('canals').where({ id: canal }).first('status')).toEqual({ status: 'set-up' });
  });
});
