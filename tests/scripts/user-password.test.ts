// npm run user:password: a director sets a new password for someone who forgot theirs; every
// session of the account ends and its sign-in holds are lifted.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import knexFactory from 'knex';
import { afterAll, describe, expect, it } from 'vitest';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import { createSession, sessionUser } from '../../src/lib/server/sessions';
import { recordSigninFailure, signinHold } from '../../src/lib/server/signin-limits';
import { checkPassword } from '../../src/lib/server/users';
import { ROOT, TSX } from '../helpers/paths';

const dir = mkdtempSync(join(tmpdir(), 'coneline-userpw-'));
const dbFile = join(dir, 'db.sqlite');
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function run(script: string, input: string, ...args: string[]) {
  const r = spawnSync(process.execPath, [TSX, script, ...args], {
    cwd: ROOT,
    env: { ...process.env, DB_FILE: dbFile },
    encoding: 'utf8',
    input,
    timeout: 30_000,
  });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

async function withDb<T>(fn: (k: ReturnType<typeof knexFactory>) => Promise<T>): Promise<T> {
  const k = knexFactory(sqliteOptions(dbFile));
  try {
    return await fn(k);
  } finally {
    await k.destroy();
  }
}

describe('npm run user:password', () => {
  const email = 'forgetful.student@school.example';

  it('sets a new password, ends every session and lifts the sign-in holds', async () => {
    const made = run(
      'scripts/user-add.ts',
      'first-password-of-twelve\n',
      '--email',
      email,
      '--name',
      'Forgetful Student',
      '--role',
      'student',
      '--password-stdin',
    );
    expect(made.code, made.err).toBe(0);
    const sid = await withDb(async (k) => {
      const user = await k('users').where({ email }).first();
      const s = await createSession(k, user!.id);
      for (let i = 0; i < 5; i++) await recordSigninFailure(k, email, '10.9.9.9');
      return s;
    });
    expect(await withDb((k) => signinHold(k, email, '10.9.9.9'))).toBeGreaterThan(0);

    const r = run('scripts/user-password.ts', 'a-brand-new-passphrase\n', '--email', email, '--password-stdin');
    expect(r.code, r.err).toBe(0);
    expect(r.out).toContain('1 session(s) ended, 1 sign-in hold(s) lifted');
    await withDb(async (k) => {
      expect(await sessionUser(k, sid)).toBeUndefined();
      expect(await signinHold(k, email, '10.9.9.9')).toBe(0);
      expect(await checkPassword(k, email, 'a-brand-new-passphrase')).not.toBeNull();
      expect(await checkPassword(k, email, 'first-password-of-twelve')).toBeNull();
      expect(await k('audit_log').where({ action: 'user.password-set' }).count<{ n: number }[]>({ n: '*' })).toEqual([
        { n: 1 },
      ]);
    });
  });

  it('refuses an unknown account, a weak password, and a deactivated account, changing nothing', async () => {
    expect(
      run(
        'scripts/user-password.ts',
        'a-brand-new-passphrase\n',
        '--email',
        'nobody@school.example',
        '--password-stdin',
      ).err,
    ).toContain('there is no account for nobody@school.example');
    expect(run('scripts/user-password.ts', 'short\n', '--email', email, '--password-stdin').err).toContain(
      'at least 12',
    );
    await withDb((k) => k('users').where({ email }).update({ active: false }));
    const r = run('scripts/user-password.ts', 'yet-another-passphrase\n', '--email', email, '--password-stdin');
    expect(r.code).toBe(1);
    expect(r.err).toContain('deactivated');
    expect(
      await withDb((k) =>
        checkPassword(k, email, 'a-brand-new-passphrase').then(() => k('users').where({ email }).first()),
      ),
    ).toBeDefined();
  });
});
