import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import knexFactory from 'knex';
import { afterAll, describe, expect, it } from 'vitest';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import { checkPassword } from '../../src/lib/server/users';
import { ROOT, TSX } from '../helpers/paths';

const dir = mkdtempSync(join(tmpdir(), 'coneline-useradd-'));
const dbFile = join(dir, 'db.sqlite');
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Runs user:add with standard input from a pipe (not a terminal), empty unless `input` is given. */
function userAddWithInput(input: string, ...args: string[]) {
  const r = spawnSync(process.execPath, [TSX, 'scripts/user-add.ts', ...args], {
    cwd: ROOT,
    env: { ...process.env, DB_FILE: dbFile },
    encoding: 'utf8',
    input,
    timeout: 30_000,
  });
  return { code: r.status, out: r.stdout, err: r.stderr };
}
const userAdd = (...args: string[]) => userAddWithInput('', ...args);

async function canSignIn(email: string, password: string): Promise<boolean> {
  const k = knexFactory(sqliteOptions(dbFile));
  try {
    return (await checkPassword(k, email, password)) !== null;
  } finally {
    await k.destroy();
  }
}

describe('npm run user:add', () => {
  it('creates the first director on a fresh database', () => {
    const r = userAdd(
      '--email',
      'Head@Example.org',
      '--name',
      'Ada Director',
      '--role',
      'director',
      '--password',
      'a-long-enough-pass',
    );
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    expect(r.out).toContain('Created director head@example.org');
  });

  it('creates a student in a cohort, assigned to an attending', async () => {
    expect(
      userAdd(
        '--email',
        'att@example.org',
        '--name',
        'Ann Attending',
        '--role',
        'attending',
        '--password',
        'another-long-pass',
      ).code,
    ).toBe(0);
    const r = userAdd(
      '--email',
      'stu@example.org',
      '--name',
      'Sam Student',
      '--role',
      'student',
      '--password',
      'student-long-pass',
      '--attending',
      'att@example.org',
      '--cohort',
      'Class of 2029',
    );
    expect(r.code).toBe(0);
    const k = knexFactory(sqliteOptions(dbFile));
    try {
      const row = await k('users')
        .join('cohorts', 'cohorts.id', 'users.cohort_id')
        .where('users.email', 'stu@example.org')
        .first('cohorts.name');
      expect(row.name).toBe('Class of 2029');
      const a = await k('assignments').count({ n: '*' }).first();
      expect(Number(a?.n)).toBe(1);
    } finally {
      await k.destroy();
    }
  });

  it('refuses a second account with the same e-mail, in any letter case', () => {
    const r = userAdd(
      '--email',
      'head@example.org',
      '--name',
      'Someone',
      '--role',
      'student',
      '--password',
      'a-long-enough-pass',
    );
    expect(r.code).toBe(1);
    expect(r.err).toContain('an account for head@example.org already exists');
  });

  it('refuses a password under 12 characters, saying why', () => {
    const r = userAdd(
      '--email',
      'short@example.org',
      '--name',
      'Shorty',
      '--role',
      'student',
      '--password',
      'elevenchars',
    );
    expect(r.code).toBe(1);
    expect(r.err).toContain('Use at least 12 characters.');
  });

  it('refuses an unknown role and a missing field with a usage line, not a stack trace', () => {
    const bad = userAdd(
      '--email',
      'x@example.org',
      '--name',
      'X',
      '--role',
      'janitor',
      '--password',
      'a-long-enough-pass',
    );
    expect(bad.code).toBe(1);
    expect(bad.err).toContain('role must be student, attending or director');
    const missing = userAdd('--email', 'y@example.org');
    expect(missing.code).toBe(1);
    expect(missing.err).toMatch(/--name is required/);
    expect(missing.err).not.toMatch(/\n\s+at /);
  });
});

describe('npm run user:add: the password', () => {
  const who = (email: string) => ['--email', email, '--name', 'Pat Example', '--role', 'student'];

  it('is read as one line from standard input with --password-stdin, without its line ending', async () => {
    const r = userAddWithInput(
      'obturation-by-stdin\r\nthe second line is not read\n',
      ...who('stdin@example.org'),
      '--password-stdin',
    );
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    expect(await canSignIn('stdin@example.org', 'obturation-by-stdin')).toBe(true);
  });

  it('is read from standard input that ends without a new line', async () => {
    expect(userAddWithInput('no-newline-at-the-end', ...who('eof@example.org'), '--password-stdin').code).toBe(0);
    expect(await canSignIn('eof@example.org', 'no-newline-at-the-end')).toBe(true);
  });

  it.each([
    ['an empty standard input', '', 'no password on standard input'],
    ['an empty first line', '\nsecond-line-password\n', 'no password on standard input'],
    ['a listed password', 'Password1234\n', 'That password is on a list of commonly used passwords; choose another.'],
    ['spaces only', ' '.repeat(14) + '\n', 'A password cannot be only spaces.'],
    ['11 characters', 'elevenchars\n', 'Use at least 12 characters.'],
  ])('is refused from --password-stdin with %s, saying why', (_label, input, message) => {
    const r = userAddWithInput(input, ...who('refused@example.org'), '--password-stdin');
    expect(r.code).toBe(1);
    expect(r.err).toContain(message);
    expect(r.err).not.toMatch(/\n\s+at /);
  });

  it('is refused when given both ways at once', () => {
    const r = userAddWithInput(
      'a-long-enough-pass\n',
      ...who('both@example.org'),
      '--password',
      'a-long-enough-pass',
      '--password-stdin',
    );
    expect(r.code).toBe(1);
    expect(r.err).toContain('use --password-stdin or --password, not both');
  });

  it('is asked for only in a terminal: without one and without a flag it says how to give it', () => {
    const r = userAdd(...who('none@example.org'));
    expect(r.code).toBe(1);
    expect(r.err).toContain(
      'no password: run it in a terminal to be asked, or give one line on standard input with --password-stdin',
    );
  });

  it('has a usage text that warns --password shows the password in the process list', () => {
    const r = userAdd('--email', 'y@example.org');
    expect(r.code).toBe(1);
    expect(r.err).toContain('--password-stdin');
    expect(r.err).toMatch(/--password P[^\n]*\n?[^\n]*process list/);
  });

  // util-linux's script(1) gives the command a terminal, as a person at a keyboard has.
  it.skipIf(!existsSync('/usr/bin/script'))('is asked for twice in a terminal, and never shown', async () => {
    const cmd = [process.execPath, TSX, 'scripts/user-add.ts', ...who('tty@example.org')]
      .map((a) => `'${a}'`)
      .join(' ');
    const child = spawn('/usr/bin/script', ['-qec', cmd, '/dev/null'], {
      cwd: ROOT,
      env: { ...process.env, DB_FILE: dbFile },
      stdio: 'pipe',
    });
    let screen = '';
    child.stdout.on('data', (d: Buffer) => (screen += d.toString()));
    const exited = new Promise<number | null>((resolve) => child.on('exit', resolve));
    const waitFor = async (text: string) => {
      for (const deadline = Date.now() + 20_000; !screen.includes(text); await new Promise((r) => setTimeout(r, 50))) {
        if (child.exitCode !== null || Date.now() > deadline)
          throw new Error(`no ${JSON.stringify(text)} in: ${screen}`);
      }
    };
    await waitFor('Password:');
    child.stdin.write('typed-at-the-chair\r');
    await waitFor('Same password again:');
    child.stdin.write('typed-at-the-chair\r');
    expect(await exited).toBe(0);
    expect(screen).toContain('Created student tty@example.org');
    expect(screen).not.toContain('typed-at-the-chair');
    expect(await canSignIn('tty@example.org', 'typed-at-the-chair')).toBe(true);
  });
});
