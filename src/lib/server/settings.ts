/**
 * The settings store: course settings a director may change, as named numbers (a yes/no
 * setting is 0 or 1), each with a documented range and default, under one version number
 * that rises with every change. The tolerances' ranges and defaults are the rules core's.
 */
import type { Knex } from 'knex';
import { DEFAULT_TOLERANCES, TOLERANCE_RANGES, type Tolerances } from '../rules/index';
import { audit } from './audit';
import type { SettingRow, SettingsVersionRow } from './tables';

export interface SettingDef {
  default: number;
  min: number;
  max: number;
  /** Whole numbers only (counts, and 0/1 for yes/no). */
  whole: boolean;
  doc: string;
}

const REQUIREMENT_RANGE = { min: 0, max: 50, whole: true };

/** Every setting: the tolerances (src/lib/rules/tolerances.ts), then the graduation requirements. */
export const SETTING_DEFS = Object.freeze({
  ...(Object.fromEntries(
    (Object.keys(DEFAULT_TOLERANCES) as (keyof Tolerances)[]).map((key) => [
      key,
      {
        default: DEFAULT_TOLERANCES[key],
        ...TOLERANCE_RANGES[key],
        whole: key === 'minAccessoryCones' || key === 'requireConeFitApproval',
        doc: `A tolerance of the checks (docs/rules.md, "Tolerances").`,
      },
    ]),
  ) as Record<keyof Tolerances, SettingDef>),
  requiredAnteriorCanals: { default: 4, ...REQUIREMENT_RANGE, doc: 'Anterior canals to complete before graduation.' },
  requiredPremolarCanals: { default: 4, ...REQUIREMENT_RANGE, doc: 'Premolar canals to complete before graduation.' },
  requiredMolarCanals: { default: 6, ...REQUIREMENT_RANGE, doc: 'Molar canals to complete before graduation.' },
}) satisfies Record<string, SettingDef>;

export type SettingName = keyof typeof SETTING_DEFS;
export type SettingValues = Record<SettingName, number>;
export const SETTING_NAMES = Object.keys(SETTING_DEFS) as SettingName[];

/** The settings in force and the version they carry. */
export interface Settings {
  version: number;
  values: SettingValues;
}

const isSettingName = (key: string): key is SettingName => Object.hasOwn(SETTING_DEFS, key);

/** Why `value` may not be stored for `name`, or null when it may. */
export function settingError(name: string, value: unknown): string | null {
  if (!isSettingName(name)) return `${name} is not a setting`;
  const d = SETTING_DEFS[name];
  if (typeof value !== 'number' || !Number.isFinite(value)) return `${name} must be a number`;
  if (d.whole && !Number.isInteger(value)) return `${name} must be a whole number`;
  if (value < d.min || value > d.max) return `${name} must lie between ${d.min} and ${d.max}`;
  return null;
}

/** The settings version alone (one small query). */
export async function settingsVersion(k: Knex): Promise<number> {
  const row = (await k('settings_version').where({ id: 1 }).first('version')) as SettingsVersionRow | undefined;
  return row?.version ?? 1;
}

/**
 * Every setting and the version, in two queries: read once per batch, not per canal. A stored
 * value that is unreadable or out of its range is logged and replaced by its default.
 */
export async function readSettings(k: Knex): Promise<Settings> {
  const values = Object.fromEntries(SETTING_NAMES.map((n) => [n, SETTING_DEFS[n].default])) as SettingValues;
  const rows = (await k('settings').select('key', 'value_json').whereIn('key', SETTING_NAMES)) as Pick<
    SettingRow,
    'key' | 'value_json'
  >[];
  for (const row of rows) {
    let value: unknown;
    try {
      value = JSON.parse(row.value_json);
    } catch {
      value = row.value_json;
    }
    const error = settingError(row.key, value);
    if (error === null) values[row.key as SettingName] = value as number;
    else
      console.warn(
        `[settings] stored ${row.key} = ${row.value_json} is not usable (${error}); using the default ${SETTING_DEFS[row.key as SettingName].default}`,
      );
  }
  return { version: await settingsVersion(k), values };
}

/** The tolerances among the settings, as the rules core takes them. */
export function tolerancesOf(values: SettingValues): Tolerances {
  return Object.fromEntries(
    (Object.keys(DEFAULT_TOLERANCES) as (keyof Tolerances)[]).map((k) => [k, values[k]]),
  ) as unknown as Tolerances;
}

/** The tolerances in force. */
export async function tolerances(k: Knex): Promise<Tolerances> {
  return tolerancesOf((await readSettings(k)).values);
}

export interface Requirements {
  /** Canals to complete before graduation, by tooth group. */
  canals: { anterior: number; premolar: number; molar: number };
}

export async function requirements(k: Knex): Promise<Requirements> {
  const { values } = await readSettings(k);
  return {
    canals: {
      anterior: values.requiredAnteriorCanals,
      premolar: values.requiredPremolarCanals,
      molar: values.requiredMolarCanals,
    },
  };
}

export class SettingsError extends Error {}

/**
 * Stores `changes` by `actorId` in one transaction with the raised version and an audit
 * line; answers the new settings. Throws SettingsError, storing nothing, when any value is
 * not a setting or lies outside its range. Re-judging the canals is the caller's
 * (settings-service.ts).
 */
export async function writeSettings(
  k: Knex,
  actorId: number | null,
  changes: Readonly<Record<string, unknown>>,
): Promise<Settings> {
  const errors = Object.entries(changes)
    .map(([name, value]) => settingError(name, value))
    .filter((e): e is string => e !== null);
  if (errors.length > 0) throw new SettingsError(errors.join('; '));
  return k.transaction(async (trx) => {
    for (const [key, value] of Object.entries(changes)) {
      await trx('settings')
        .insert({ key, value_json: JSON.stringify(value), updated_by: actorId, updated_at: trx.fn.now() })
        .onConflict('key')
        .merge();
    }
    await trx('settings_version').where({ id: 1 }).increment('version', 1);
    const settings = await readSettings(trx);
    await audit(trx, actorId, 'settings.change', 'settings', String(settings.version), { changes });
    return settings;
  });
}
