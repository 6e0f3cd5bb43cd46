import { spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import knexFactory, { type Knex } from 'knex';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { DEMO } from '../helpers/client';
import { ROOT, TEMPLATE_DB, TSX } from '../helpers/paths';
import { sqliteOptions } from '../../src/lib/server/knex-options';

let dir: string;
let dbFile: string;
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'coneline-demoremove-'));
  dbFile = join(dir, 'db.sqlite');
  copyFileSync(TEMPLATE_DB, dbFile);
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

function demoRemove(file = dbFile) {
  const r = spawnSync(process.execPath, [TSX, 'scripts/demo-remove.ts'], {
    cwd: ROOT,
    env: { ...process.env, DB_FILE: file },
    encoding: 'utf8',
  });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

async function withDb<T>(fn: (k: Knex) => Promise<T>): Promise<T> {
  const k = knexFactory(sqliteOptions(dbFile));
  try {
    return await fn(k);
  } finally {
    await k.destroy();
  }
}

const idOf = (rows: unknown[]) => (rows[0] as { id: number }).id;
const total = async (k: Knex, table: string) => Number(((await k(table).count({ n: '*' }).first()) as { n: number }).n);

/** A real student in the demo cohort, assigned to a demo attending, with a case of their own. */
async function addRealStudent(k: Knex): Promise<{ studentId: number; caseId: string }> {
  const cohort = (await k('cohorts').where({ demo: true }).first('id')) as { id: number };
  const studentId = idOf(
    await k('users')
      .insert({ email: 'real.student@example.org', name: 'Real Student', role: 'student', cohort_id: cohort.id })
      .returning('id'),
  );
  const helen = (await k('users').where({ email: DEMO.helen }).first('id')) as { id: number };
  await k('assignments').insert({ attending_id: helen.id, student_id: studentId });
  const caseId = '00000000-0000-4000-8000-00000000c0de';
  await k('cases').insert({ id: caseId, student_id: studentId, setting: 'block', opened_at: '2026-12-02T09:00:00Z' });
  return { studentId, caseId };
}

describe('npm run demo:remove', () => {
  it('removes every demo account and all that belongs to them, says what it removed, and keeps audit lines without an actor', async () => {
    const counts = await withDb(async (k) => {
      await k('users').insert({ email: 'head@example.org', name: 'Real Director', role: 'director' });
      const ingrid = (await k('users').where({ email: DEMO.ingrid }).first('id')) as { id: number };
      await k('audit_log').insert({ at: '2026-12-02T10:00:00Z', actor_id: ingrid.id, action: 'user.created' });
      return { cases: await total(k, 'cases'), canals: await total(k, 'canals'), events: await total(k, 'events') };
    });
    const r = demoRemove();
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    expect(r.out).toContain(
      `removed the demo clinic from ${dbFile}: 6 accounts, 1 cohort, ${counts.cases} cases, ${counts.canals} canals, ${counts.events} events`,
    );
    expect(r.out).toContain('4 assignments');
    expect(r.out).toContain('Kept 1 audit line that named a demo account as actor');
    await withDb(async (k) => {
      expect(await k('users').pluck('email')).toEqual(['head@example.org']);
      for (const table of ['cohorts', 'cases', 'canals', 'events', 'findings', 'signoffs', 'assignments'])
        expect(await total(k, table), table).toBe(0);
      expect(await k('audit_log').where({ action: 'user.created' }).pluck('actor_id')).toEqual([null]);
      expect(await k('audit_log').where({ action: 'demo.removed' }).count({ n: '*' }).first()).toEqual({ n: 1 });
    });
  });

  it('is safe to run twice: the second run finds nothing and removes nothing', async () => {
    expect(demoRemove().code).toBe(0);
    const again = demoRemove();
    expect(again.code).toBe(0);
    expect(again.out).toContain('no demo clinic');
    expect(again.out).toContain('nothing removed');
    await withDb(async (k) =>
      expect(await k('audit_log').where({ action: 'demo.removed' }).count({ n: '*' }).first()).toEqual({ n: 1 }),
    );
  });

  it('keeps a real student, their case, and the demo cohort they belong to, but not their tie to a demo attending', async () => {
    const real = await withDb(addRealStudent);
    expect(demoRemove().code).toBe(0);
    await withDb(async (k) => {
      expect(await k('users').pluck('id')).toEqual([real.studentId]);
      expect(await k('cases').pluck('id')).toEqual([real.caseId]);
      expect(await total(k, 'cohorts')).toBe(1);
      expect(await total(k, 'assignments')).toBe(0);
    });
  });

  it("refuses, removing nothing, when a demo attending signed off a real student's case", async () => {
    await withDb(async (k) => {
      const real = await addRealStudent(k);
      const samuel = (await k('users').where({ email: DEMO.samuel }).first('id')) as { id: number };
      await k('signoffs').insert({
        case_id: real.caseId,
        checkpoint: 'final',
        decision: 'approved',
        attending_id: samuel.id,
        created_at: '2026-12-03T09:00:00Z',
      });
    });
    const r = demoRemove();
    expect(r.code).toBe(1);
    expect(r.err).toContain("1 sign-off by a demo account in real students' cases");
    expect(r.err).toContain('Nothing was removed');
    await withDb(async (k) =>
      expect(await k('users').where({ demo: true }).count({ n: '*' }).first()).toEqual({ n: 6 }),
    );
  });

  it('says there is nothing to remove when the database does not exist, without making one', () => {
    const missing = join(dir, 'none.sqlite');
    const r = demoRemove(missing);
    expect(r.code).toBe(0);
    expect(r.out).toContain('nothing removed');
    expect(existsSync(missing)).toBe(false);
  });
});
