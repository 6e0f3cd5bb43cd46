import { spawnSync } from 'node:child_process';
import { copyFileSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ROOT, TEMPLATE_DB, TSX } from '../helpers/paths';
import { runScript, type ScriptRun } from '../helpers/script-process';

const SECRET = 'serve-test-secret-serve-test-secret-0123';
/** A real install's mail settings (nothing is sent in these tests). */
const MAIL = {
  SMTP_HOST: '127.0.0.1',
  MAIL_FROM: 'Coneline <coneline@school.example>',
  PUBLIC_URL: 'http://localhost:4321',
};

let dir: string;
let dbFile: string;
let running: ScriptRun | null = null;
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'coneline-serve-'));
  dbFile = join(dir, 'db.sqlite');
});
afterEach(async () => {
  await running?.stop();
  running = null;
  rmSync(dir, { recursive: true, force: true });
});

/** `npm run serve -- --no-build` (the tests' build is already there). */
async function serve(env: Record<string, string>): Promise<ScriptRun> {
  running = await runScript(['--import', 'tsx', 'scripts/serve.ts', '--no-build'], {
    DB_FILE: dbFile,
    DATA_DIR: dir,
    ...env,
  });
  return running;
}

function userAdd(...args: string[]): void {
  const r = spawnSync(process.execPath, [TSX, 'scripts/user-add.ts', ...args], {
    cwd: ROOT,
    env: { ...process.env, DB_FILE: dbFile },
    encoding: 'utf8',
  });
  expect(r.stderr).toBe('');
}

const addDirector = () =>
  userAdd(
    '--email',
    'head@school.example',
    '--name',
    'Head of Endodontics',
    '--role',
    'director',
    '--password',
    'a-real-directors-pass',
  );

describe('npm run serve', () => {
  it('is registered in package.json', () => {
    const pkg = JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8')) as { scripts: Record<string, string> };
    expect(pkg.scripts.serve).toBe('node --import tsx scripts/serve.ts');
  });

  it('refuses to start on a database that holds the demo clinic, saying how to remove it', async () => {
    copyFileSync(TEMPLATE_DB, dbFile);
    const r = await serve({ AUTH_SECRET: SECRET });
    expect(r.code).toBe(1);
    expect(r.out).toContain('6 active demo accounts');
    expect(r.out).toContain('npm run demo:remove');
    expect(r.out).not.toContain('Coneline is listening');
  });

  it('refuses to start without AUTH_SECRET, saying how to make one', async () => {
    addDirector();
    const r = await serve({});
    expect(r.code).toBe(1);
    expect(r.out).toContain('AUTH_SECRET is not set');
    expect(r.out).toContain('openssl rand -hex 32');
    expect(r.out).not.toContain('Coneline is listening');
  });

  it('names every missing thing at once', async () => {
    copyFileSync(TEMPLATE_DB, dbFile);
    const r = await serve({ HOST: '0.0.0.0' });
    expect(r.code).toBe(1);
    for (const part of ['npm run demo:remove', 'AUTH_SECRET is not set', 'PUBLIC_HOST is not set'])
      expect(r.out).toContain(part);
  });

  it('refuses to start without SMTP_HOST and MAIL_FROM, naming them', async () => {
    addDirector();
    const r = await serve({ AUTH_SECRET: SECRET, PUBLIC_URL: MAIL.PUBLIC_URL, SMTP_HOST: '', MAIL_FROM: '' });
    expect(r.code).toBe(1);
    expect(r.out).toContain('needs SMTP_HOST, MAIL_FROM (not set)');
    expect(r.out).not.toContain('Coneline is listening');
  });

  it('never seeds: an empty database stays empty, and serve says how to make the first director', async () => {
    const r = await serve({ AUTH_SECRET: SECRET, ...MAIL });
    expect(r.out).toContain('npm run user:add');
    expect(r.out).toContain('Coneline is listening');
    const res = await fetch(`${r.baseUrl}/signin`);
    expect(res.status).toBe(200);
    expect(await res.text()).not.toContain('data-testid="demo-banner"');
  });

  it('starts on a migrated database with a director made by user:add, and answers /signin', async () => {
    addDirector();
    const r = await serve({ AUTH_SECRET: SECRET, ...MAIL });
    expect(r.out).toContain('Coneline is listening');
    expect(r.out).not.toContain('npm run user:add');
    const res = await fetch(`${r.baseUrl}/signin`);
    expect(res.status).toBe(200);
    expect(await res.text()).not.toContain('data-testid="demo-banner"');
    // As a service manager stops it: SIGTERM to serve alone ends the server it started too.
    r.proc.kill('SIGTERM');
    expect(await r.done).toBe(0);
  });
});
