// The generated AUTH_SECRET signs every session: whoever reads its file can forge one.
import { chmodSync, mkdirSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';

const mode = (path: string) => statSync(path).mode & 0o7777;
const saved = { ...process.env };
let dir: string;

beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'coneline-secret-'));
  delete process.env.AUTH_SECRET;
  Object.assign(process.env, { DATA_DIR: join(dir, 'data'), DB_FILE: join(dir, 'data', 'coneline.sqlite') });
  vi.resetModules();
});
afterEach(() => {
  process.env = { ...saved };
  rmSync(dir, { recursive: true, force: true });
});

const freshConfig = async () => (await import('../../../src/lib/server/config')).config;

describe('config: the generated auth secret', () => {
  it('is written 0600 into a data folder made 0700', async () => {
    const secret = (await freshConfig())().authSecret;
    expect(secret).toMatch(/^[0-9a-f]{64}$/);
    expect([mode(join(dir, 'data')), mode(join(dir, 'data', 'auth-secret'))]).toEqual([0o700, 0o600]);
  });

  it('is taken back to 0600, and its folder to 0700, when found with wider modes', async () => {
    const data = join(dir, 'data');
    mkdirSync(data);
    chmodSync(data, 0o755);
    writeFileSync(join(data, 'auth-secret'), `${'cd'.repeat(32)}\n`);
    chmodSync(join(data, 'auth-secret'), 0o644);
    expect((await freshConfig())().authSecret).toBe('cd'.repeat(32));
    expect([mode(data), mode(join(data, 'auth-secret'))]).toEqual([0o700, 0o600]);
    expect(readFileSync(join(data, 'auth-secret'), 'utf8')).toBe(`${'cd'.repeat(32)}\n`);
  });
});
