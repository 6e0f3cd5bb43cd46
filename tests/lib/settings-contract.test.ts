// The settings' part of the contract: the form's and the PUT body's zod schemas refuse what the
// server refuses, each message naming the field and its range.
import { describe, expect, it } from 'vitest';
import {
  isYesNo,
  rangeError,
  SETTING_DEFS,
  SETTING_NAMES,
  settingError,
  settingGroup,
  settingRangeText,
  settingsErrorField,
  settingsFormSchema,
  settingSource,
  settingsPutSchema,
  settingValueText,
  type SettingDef,
} from '../../src/lib/settings-contract';
import { formatZodError } from '../../src/lib/rules/index';

const ID = '2b0f6a7e-93a4-4d53-9d7f-6f1f0c1e2a3b';
const defaults = Object.fromEntries(SETTING_NAMES.map((n) => [n, SETTING_DEFS[n].default]));

describe('settingsPutSchema', () => {
  it('takes any of the settings by name', () => {
    expect(settingsPutSchema.safeParse({ id: ID, values: { minAccessoryCones: 4 } }).success).toBe(true);
    expect(settingsPutSchema.safeParse({ id: ID, values: defaults }).success).toBe(true);
  });

  it.each([
    [{ noSuchSetting: 1 }, 'noSuchSetting', /not allowed: noSuchSetting/],
    [{ fillShortLimitMm: 3.5 }, 'fillShortLimitMm', /^fillShortLimitMm must lie between 0.5 and 3 mm$/],
    [{ minAccessoryCones: 2.5 }, 'minAccessoryCones', /^minAccessoryCones must be a whole number from 0 to 10 cones$/],
    [{ requiredMolarCanals: -1 }, 'requiredMolarCanals', /from 0 to 50 canals/],
    [{ taperShortMarginMm: '1' }, 'taperShortMarginMm', /^taperShortMarginMm must be a number$/],
  ])('refuses %j naming %s', (values, field, message) => {
    const r = settingsPutSchema.safeParse({ id: ID, values });
    expect(r.success).toBe(false);
    if (r.success) return;
    expect(settingsErrorField(r.error)).toBe(field);
    expect(formatZodError(r.error)).toMatch(message);
  });

  it('refuses an empty change and an id that is not a UUID', () => {
    expect(settingsPutSchema.safeParse({ id: ID, values: {} }).success).toBe(false);
    expect(settingsPutSchema.safeParse({ id: 'x', values: { minAccessoryCones: 4 } }).success).toBe(false);
  });
});

describe('settingsFormSchema', () => {
  it('needs every setting and says the same as the server', () => {
    expect(settingsFormSchema.safeParse(defaults).success).toBe(true);
    const r = settingsFormSchema.safeParse({ ...defaults, fallbackStopDepthMm: 20 });
    expect(r.success).toBe(false);
    if (!r.success) expect(formatZodError(r.error)).toBe(settingError('fallbackStopDepthMm', 20));
    const empty = settingsFormSchema.safeParse({ ...defaults, fallbackStopDepthMm: Number.NaN });
    expect(empty.success).toBe(false);
  });
});

describe('a yes/no setting', () => {
  const yesNo: SettingDef = { default: 0, min: 0, max: 1, whole: true, doc: 'A yes/no policy.' };
  it('is 0 or 1, shown as no or yes, and its refusal says so', () => {
    expect(isYesNo(yesNo)).toBe(true);
    expect(settingRangeText(yesNo)).toBe('0 (no) or 1 (yes)');
    expect(settingValueText(yesNo, 1)).toBe('yes');
    expect(rangeError('someFlag', yesNo)).toBe('someFlag must be 0 (no) or 1 (yes)');
    expect(isYesNo(SETTING_DEFS.minAccessoryCones)).toBe(false);
  });
});

describe('settingSource and settingGroup', () => {
  it('name the published source for a tolerance and school policy for a requirement', () => {
    expect(settingSource('taperShortMarginMm')).toBe('trade teaching (practice)');
    expect(settingSource('requiredAnteriorCanals')).toBe('school policy');
    expect(settingGroup('taperShortMarginMm')).toBe('tolerance');
    expect(settingGroup('requiredBlockCanals')).toBe('requirement');
  });
});
