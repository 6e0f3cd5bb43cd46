import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import knexFactory from 'knex';
import { afterAll, describe, expect, it } from 'vitest';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import { ROOT, TSX } from '../helpers/paths';

const dir = mkdtempSync(join(tmpdir(), 'coneline-useradd-'));
const dbFile = join(dir, 'db.sqlite');
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function userAdd(...args: string[]) {
  const r = spawnSync(process.execPath, [TSX, 'scripts/user-add.ts', ...args], { cwd: ROOT, env: { ...process.env, DB_FILE: dbFile }, encoding: 'utf8' });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

describe('npm run user:add', () => {
  it('creates the first director on a fresh database', () => {
    const r = userAdd('--email', 'Head@Example.org', '--name', 'Ada Director', '--role', 'director', '--password', 'a-long-enough-pass');
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    expect(r.out).toContain('Created director head@example.org');
  });

  it('creates a student in a cohort, assigned to an attending', async () => {
    expect(userAdd('--email', 'att@example.org', '--name', 'Ann Attending', '--role', 'attending', '--password', 'another-long-pass').code).toBe(0);
    const r = userAdd('--email', 'stu@example.org', '--name', 'Sam Student', '--role', 'student', '--password', 'student-long-pass', '--attending', 'att@example.org', '--cohort', 'Class of 2029');
    expect(r.code).toBe(0);
    const k = knexFactory(sqliteOptions(dbFile));
    try {
      const row = await k('users').join('cohorts', 'cohorts.id', 'users.cohort_id').where('users.email', 'stu@example.org').first('cohorts.name');
      expect(row.name).toBe('Class of 2029');
      const a = await k('assignments').count({ n: '*' }).first();
      expect(Number(a?.n)).toBe(1);
    } finally {
      await k.destroy();
    }
  });

  it('refuses a second account with the same e-mail, in any letter case', () => {
    const r = userAdd('--email', 'head@example.org', '--name', 'Someone', '--role', 'student', '--password', 'a-long-enough-pass');
    expect(r.code).toBe(1);
    expect(r.err).toContain('an account for head@example.org already exists');
  });

  it('refuses a password under 12 characters, saying why', () => {
    const r = userAdd('--email', 'short@example.org', '--name', 'Shorty', '--role', 'student', '--password', 'elevenchars');
    expect(r.code).toBe(1);
    expect(r.err).toContain('Use at least 12 characters.');
  });

  it('refuses an unknown role and a missing field with a usage line, not a stack trace', () => {
    const bad = userAdd('--email', 'x@example.org', '--name', 'X', '--role', 'janitor', '--password', 'a-long-enough-pass');
    expect(bad.code).toBe(1);
    expect(bad.err).toContain('role must be student, attending or director');
    const missing = userAdd('--email', 'y@example.org');
    expect(missing.code).toBe(1);
    expect(missing.err).toMatch(/--name is required/);
    expect(missing.err).not.toMatch(/\n\s+at /);
  });
});
