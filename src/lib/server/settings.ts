/**
 * The settings store: course settings a director may change, as named numbers (a yes/no
 * setting is 0 or 1), each with a documented range and default, under one version number
 * that rises with every change. The tolerances' ranges and defaults are the rules core's.
 */
import type { Knex } from 'knex';
import { DEFAULT_TOLERANCES, type Tolerances } from '../rules/index';
import {
  isSettingName,
  SETTING_DEFS,
  SETTING_NAMES,
  settingError,
  type SettingName,
  type SettingValues,
} from '../settings-contract';
import { audit } from './audit';
import type { SettingRow, SettingsVersionRow } from './tables';

// The definitions are the contract's (src/lib/settings-contract.ts, docs/settings.md).
export { SETTING_DEFS, SETTING_NAMES, settingError, type SettingName, type SettingValues };
export type { SettingDef } from '../settings-contract';

/** The settings in force and the version they carry. */
export interface Settings {
  version: number;
  values: SettingValues;
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
  /** Canals to complete before graduation, by tooth group (FDI x1–x3, x4–x5, x6–x8). */
  canals: { anterior: number; premolar: number; molar: number };
  /** Canals to complete before graduation, by the case's setting. */
  bySetting: { block: number; extracted: number; patient: number };
}

export async function requirements(k: Knex): Promise<Requirements> {
  const { values } = await readSettings(k);
  return {
    canals: {
      anterior: values.requiredAnteriorCanals,
      premolar: values.requiredPremolarCanals,
      molar: values.requiredMolarCanals,
    },
    bySetting: {
      block: values.requiredBlockCanals,
      extracted: values.requiredExtractedCanals,
      patient: values.requiredPatientCanals,
    },
  };
}

/** A value that may not be stored; `field` names the setting. */
export class SettingsError extends Error {
  constructor(
    message: string,
    readonly field?: string,
  ) {
    super(message);
  }
}

/** A change made to a version that is no longer in force; `current` is the one that is. */
export class StaleSettingsError extends Error {
  constructor(readonly current: Settings) {
    super(`the settings changed since version ${current.version - 1}`);
  }
}

/** One setting's value before and after a change, as the audit line keeps it. */
export type SettingChange = { from: number; to: number };

/**
 * Stores `changes` by `actorId` in one transaction with the raised version and an audit line
 * holding each changed setting's old and new value; answers the settings then in force and
 * the names that changed. Values equal to the stored ones change nothing: when none differs,
 * nothing is written and the version stays. Throws, storing nothing, SettingsError when a
 * value is not a setting or lies outside its range, and StaleSettingsError when
 * `expectedVersion` is given and is not the version in force. Re-judging the canals is the
 * caller's (settings-service.ts).
 */
export async function writeSettings(
  k: Knex,
  actorId: number | null,
  changes: Readonly<Record<string, unknown>>,
  expectedVersion?: number,
): Promise<Settings & { changed: SettingName[] }> {
  for (const [name, value] of Object.entries(changes)) {
    const error = settingError(name, value);
    if (error !== null) throw new SettingsError(error, name);
  }
  return k.transaction(async (trx) => {
    const before = await readSettings(trx);
    if (expectedVersion !== undefined && before.version !== expectedVersion) throw new StaleSettingsError(before);
    const diff: Partial<Record<SettingName, SettingChange>> = {};
    for (const [name, value] of Object.entries(changes)) {
      if (isSettingName(name) && before.values[name] !== value)
        diff[name] = { from: before.values[name], to: value as number };
    }
    const changed = Object.keys(diff) as SettingName[];
    if (changed.length === 0) return { ...before, changed };
    for (const key of changed) {
      await trx('settings')
        .insert({ key, value_json: JSON.stringify(diff[key]!.to), updated_by: actorId, updated_at: trx.fn.now() })
        .onConflict('key')
        .merge();
    }
    await trx('settings_version').where({ id: 1 }).increment('version', 1);
    const settings = await readSettings(trx);
    await audit(trx, actorId, 'settings.change', 'settings', String(settings.version), {
      fromVersion: before.version,
      changes: diff,
    });
    return { ...settings, changed };
  });
}
