import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { TSX } from '../helpers/paths';
import { runScript, type ScriptRun } from '../helpers/script-process';

let dir: string;
let running: ScriptRun | null = null;
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'coneline-start-'));
});
afterEach(async () => {
  await running?.stop();
  running = null;
  rmSync(dir, { recursive: true, force: true });
});

describe('npm start', () => {
  it('stays the one-command demo: seeds an empty database, says so, and points real installs at npm run serve', async () => {
    // --no-build: the tests' build is already there.
    running = await runScript([TSX, 'scripts/start.ts', '--no-build'], {
      DB_FILE: join(dir, 'db.sqlite'),
      DATA_DIR: dir,
    });
    expect(running.code).toBeNull();
    expect(running.out).toContain('Demo clinic seeded');
    expect(running.out).toContain('This is the Coneline demo');
    expect(running.out).toContain('For a real install use npm run serve');
    expect(running.out).toContain('demo password: coneline-demo-2026');
    const res = await fetch(`${running.baseUrl}/signin`);
    expect(res.status).toBe(200);
    expect(await res.text()).toContain('data-testid="demo-banner"');
    // The local mail stand-in: its web mailbox is printed, on loopback, and answers.
    const mailbox = /Mailbox \(e-mail Coneline sends, kept by the local stand-in\): (http:\/\/127\.0\.0\.1:\d+)/.exec(
      running.out,
    )?.[1];
    expect(mailbox).toBeDefined();
    const list = await fetch(`${mailbox}/api/email`);
    expect(list.status).toBe(200);
    expect(Array.isArray(await list.json())).toBe(true);
  });
});
