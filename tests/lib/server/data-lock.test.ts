import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { DataFolderBusyError, holdDatabaseLock, LOCK_FILE, lockDataFolder } from '../../../src/lib/server/data-lock';
import { ROOT } from '../../helpers/paths';

let dir: string;
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'coneline-lock-'));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

/** Another process that holds the lock as the server does, until it is killed. */
async function holderProcess(dataDir: string) {
  const code = `import { holdDatabaseLock } from './src/lib/server/data-lock.ts'; holdDatabaseLock(process.argv[1]); console.log('held'); setInterval(() => {}, 1000);`;
  // tsx as a loader in this one process (its CLI would start a second one, which a kill misses).
  const child = spawn(process.execPath, ['--import', 'tsx', '--input-type=module', '--eval', code, dataDir], {
    cwd: ROOT,
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  await new Promise<void>((resolve, reject) => {
    child.stdout.on('data', (d: Buffer) => d.toString().includes('held') && resolve());
    child.once('exit', (c) => reject(new Error(`the holder exited with ${c}`)));
  });
  return child;
}

describe('lockDataFolder', () => {
  it('is refused while another process holds the folder, and free once that process has ended, however it ended', async () => {
    const child = await holderProcess(dir);
    try {
      expect(() => lockDataFolder(dir)).toThrow(DataFolderBusyError);
      expect(() => lockDataFolder(dir)).toThrow(/in use by a running Coneline server or a restore/);
    } finally {
      const exited = new Promise((r) => child.once('exit', r));
      child.kill('SIGKILL'); // no clean-up code runs: the operating system drops the lock
      await exited;
    }
    const lock = lockDataFolder(dir);
    lock.release();
  });

  it('is refused to a second holder in the same process until the first releases it', () => {
    const first = lockDataFolder(dir);
    expect(() => lockDataFolder(dir)).toThrow(DataFolderBusyError);
    first.release();
    lockDataFolder(dir).release();
  });

  it('keeps its lock file 0600 in a 0700 folder', () => {
    const data = join(dir, 'data');
    lockDataFolder(data).release();
    expect(statSync(data).mode & 0o777).toBe(0o700);
    expect(statSync(join(data, LOCK_FILE)).mode & 0o777).toBe(0o600);
  });
});

describe('holdDatabaseLock', () => {
  it('holds the folder for the rest of the process, and may be called again by the same process', () => {
    holdDatabaseLock(dir);
    holdDatabaseLock(dir);
    expect(() => lockDataFolder(dir)).toThrow(DataFolderBusyError);
  });
});
