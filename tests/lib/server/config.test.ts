// The server's one typed place for its environment.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it, vi } from 'vitest';

const saved = { ...process.env };
afterEach(() => {
  process.env = { ...saved };
  vi.resetModules();
});

async function freshConfig() {
  vi.resetModules();
  return (await import('../../../src/lib/server/config')).config;
}

describe('config', () => {
  it('refuses an AUTH_SECRET under 32 characters instead of quietly making another', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'coneline-config-'));
    try {
      Object.assign(process.env, { AUTH_SECRET: 'x'.repeat(31), DATA_DIR: dir, DB_FILE: join(dir, 'db.sqlite') });
      const config = await freshConfig();
      expect(() => config()).toThrow('AUTH_SECRET must be at least 32 characters');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('takes an AUTH_SECRET of 32 characters as it is', async () => {
    Object.assign(process.env, { AUTH_SECRET: 's'.repeat(32) });
    expect((await freshConfig())().authSecret).toBe('s'.repeat(32));
  });
});

describe('clinicFromEnv', () => {
  const load = async () => (await import('../../../src/lib/server/config')).clinicFromEnv;

  it('defaults to Europe/London and en-GB with nothing set', async () => {
    expect((await load())({})).toEqual({ timeZone: 'Europe/London', locale: 'en-GB' });
  });

  it('takes CLINIC_TIME_ZONE and CLINIC_LOCALE as given', async () => {
    expect((await load())({ CLINIC_TIME_ZONE: 'Pacific/Auckland', CLINIC_LOCALE: 'en-NZ' })).toEqual({
      timeZone: 'Pacific/Auckland',
      locale: 'en-NZ',
    });
  });

  it('refuses a zone or locale Intl does not know instead of quietly using the default', async () => {
    const clinicFromEnv = await load();
    expect(() => clinicFromEnv({ CLINIC_TIME_ZONE: 'Europe/Nowhere' })).toThrow(/CLINIC_TIME_ZONE/);
    expect(() => clinicFromEnv({ CLINIC_LOCALE: 'en_GB!' })).toThrow(/locale/);
  });
});
