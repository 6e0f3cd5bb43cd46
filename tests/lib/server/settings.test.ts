// The settings store: named numbers with ranges and defaults, under one version.
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { DEFAULT_TOLERANCES, TOLERANCE_RANGES } from '../../../src/lib/rules/index';
import {
  readSettings,
  SETTING_DEFS,
  settingError,
  SettingsError,
  tolerances,
  writeSettings,
} from '../../../src/lib/server/settings';
import { syncDb, type SyncDb } from '../../helpers/sync-db';

let db: SyncDb;
beforeAll(async () => {
  db = await syncDb();
});
afterAll(async () => {
  await db.close();
});

describe('readSettings', () => {
  it('answers the defaults and version 1 on a new database', async () => {
    const s = await readSettings(db.k);
    expect(s.version).toBe(1);
    expect(await tolerances(db.k)).toEqual(DEFAULT_TOLERANCES);
  });

  it('logs a stored value out of its range and uses the default instead', async () => {
    const warn = vi.spyOn(console, 'warn').mockImplementation(() => {});
    await db.k('settings').insert({ key: 'taperShortMarginMm', value_json: '9' });
    await db.k('settings').insert({ key: 'minAccessoryCones', value_json: '"three"' });
    const s = await readSettings(db.k);
    expect(s.values.taperShortMarginMm).toBe(DEFAULT_TOLERANCES.taperShortMarginMm);
    expect(s.values.minAccessoryCones).toBe(DEFAULT_TOLERANCES.minAccessoryCones);
    expect(warn).toHaveBeenCalledTimes(2);
    expect(warn.mock.calls.map((c) => String(c[0])).join('\n')).toMatch(
      /taperShortMarginMm.*between 0 and 3.*default 1/,
    );
    warn.mockRestore();
    await db.k('settings').whereIn('key', ['taperShortMarginMm', 'minAccessoryCones']).delete();
  });
});

describe('writeSettings', () => {
  it('stores a change, raises the version and writes an audit line together', async () => {
    const before = (await readSettings(db.k)).version;
    const after = await writeSettings(db.k, null, { fillShortLimitMm: 1.5, requiredMolarCanals: 8 });
    expect(after.version).toBe(before + 1);
    expect(after.values).toMatchObject({ fillShortLimitMm: 1.5, requiredMolarCanals: 8 });
    expect(
      await db.k('audit_log').where({ action: 'settings.change', subject_id: String(after.version) }),
    ).toHaveLength(1);
  });
});

describe('settingError and SETTING_DEFS', () => {
  it('take the tolerances’ ranges and defaults from the rules core', () => {
    for (const key of Object.keys(TOLERANCE_RANGES) as (keyof typeof TOLERANCE_RANGES)[]) {
      expect(SETTING_DEFS[key]).toMatchObject({ ...TOLERANCE_RANGES[key], default: DEFAULT_TOLERANCES[key] });
    }
  });
  it('refuses unknown names, non-numbers, fractions of whole settings and values out of range', () => {
    expect(settingError('nope', 1)).toMatch(/not a setting/);
    expect(settingError('taperShortMarginMm', '1')).toMatch(/number/);
    expect(settingError('minAccessoryCones', 3.5)).toMatch(/whole/);
    expect(settingError('fallbackStopDepthMm', 20)).toMatch(/between 8 and 16/);
    expect(settingError('fallbackStopDepthMm', 10)).toBeNull();
  });
});

describe('the tolerances at the bounds of their ranges (TOLERANCE_RANGES, docs/rules.md)', () => {
  const keys = Object.keys(TOLERANCE_RANGES) as (keyof typeof TOLERANCE_RANGES)[];
  it.each(keys)('settingError accepts %s at its minimum and maximum and refuses 0.01 beyond either', (key) => {
    const { min, max } = TOLERANCE_RANGES[key];
    expect(settingError(key, min)).toBeNull();
    expect(settingError(key, max)).toBeNull();
    expect(settingError(key, min - 0.01)).toMatch(/between|whole|0 \(no\) or 1/);
    expect(settingError(key, max + 0.01)).toMatch(/between|whole|0 \(no\) or 1/);
  });
  it('stores every tolerance at its minimum, then at its maximum, and the rules receive them', async () => {
    const at = (bound: 'min' | 'max') => Object.fromEntries(keys.map((k) => [k, TOLERANCE_RANGES[k][bound]]));
    await writeSettings(db.k, null, at('min'));
    expect(await tolerances(db.k)).toEqual(at('min'));
    await writeSettings(db.k, null, at('max'));
    expect(await tolerances(db.k)).toEqual(at('max'));
    await writeSettings(db.k, null, { ...DEFAULT_TOLERANCES });
  });
  it.each(keys)('refuses to store %s 0.01 beyond its maximum, storing nothing', async (key) => {
    const before = await readSettings(db.k);
    await expect(
      writeSettings(db.k, null, { [key]: TOLERANCE_RANGES[key].max + 0.01, requiredMolarCanals: 9 }),
    ).rejects.toBeInstanceOf(SettingsError);
    expect(await readSettings(db.k)).toEqual(before);
  });
});
