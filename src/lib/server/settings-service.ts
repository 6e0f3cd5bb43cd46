/**
 * Reading and changing the course settings (docs/settings.md). Changing needs a director and
 * the version the change was made to: it stores the new values, raises the settings version
 * and writes an audit line with each old and new value in one transaction, then starts the
 * background re-judging of unlocked canals with the new values.
 */
import type { Knex } from 'knex';
import { TOLERANCE_SOURCES } from '../rules/index';
import {
  isYesNo,
  SETTING_NAMES,
  settingGroup,
  settingRangeText,
  settingSource,
  settingStep,
  settingValueText,
  type RecomputeStatus,
  type SettingDef,
  type SettingRowView,
  type SettingsAnswer,
  type SettingsPut,
  type StaleSettingsAnswer,
} from '../settings-contract';
import { audit } from './audit';
import { db } from './db';
import { recomputeAll, recomputeProgress, startRecompute } from './recompute';
import type { Answer } from './request-ids';
import {
  readSettings,
  SETTING_DEFS,
  SettingsError,
  StaleSettingsError,
  writeSettings,
  type Settings,
} from './settings';

export { SettingsError };

/** The settings in force, their version, and each one's range and default. */
export async function getSettings(k: Knex): Promise<Settings & { defs: typeof SETTING_DEFS }> {
  return { ...(await readSettings(k)), defs: SETTING_DEFS };
}

/** The flat answer of GET /api/settings: every setting by name, and the version. */
export function settingsAnswer(s: Settings): SettingsAnswer {
  return { version: s.version, ...s.values };
}

/** The ETag of a settings version: `"7"`. */
export const settingsEtag = (version: number): string => `"${version}"`;

/**
 * The version an `If-Match` header names: `"7"` (as the ETag is sent) or a bare `7`; null when
 * it names none (absent, `*`, a list, a weak tag).
 */
export function ifMatchVersion(header: string | null): number | null {
  const m = /^\s*(?:"(\d{1,9})"|(\d{1,9}))\s*$/.exec(header ?? '');
  return m ? Number(m[1] ?? m[2]) : null;
}

/** Stores `changes` for a director; throws SettingsError for anyone else or a value out of range. */
export async function changeSettings(
  k: Knex,
  user: Pick<SessionUser, 'id' | 'role'>,
  changes: Readonly<Record<string, unknown>>,
  expectedVersion?: number,
): Promise<Settings> {
  if (user.role !== 'director') throw new SettingsError('only a director may change the course settings');
  const settings = await writeSettings(k, user.id, changes, expectedVersion);
  if (settings.changed.length > 0) void startRecompute(k);
  return settings;
}

/**
 * PUT /api/settings for a director, made to `version` (its If-Match): 200 with the settings now
 * in force, 409 with the current version when `version` is no longer it, 400 naming the field
 * when a value may not be stored. Nothing is stored unless all of it may be.
 */
export async function putSettings(
  k: Knex,
  user: Pick<SessionUser, 'id' | 'role'>,
  input: SettingsPut,
  version: number,
): Promise<Answer> {
  try {
    const settings = await changeSettings(k, user, input.values, version);
    return { status: 200, body: settingsAnswer(settings) };
  } catch (e) {
    if (e instanceof StaleSettingsError) {
      const body: StaleSettingsAnswer = {
        error: `Someone changed the settings since you loaded them (version ${version}; now ${e.current.version}). Reload them and make your change again.`,
        code: 'stale',
        version: e.current.version,
      };
      return { status: 409, body: { ...body } };
    }
    if (e instanceof SettingsError) return { status: 400, body: { error: e.message, field: e.field } };
    throw e;
  }
}

/** GET /api/settings/recompute: how far the re-judging has come. */
export function recomputeStatus(k: Knex): Promise<RecomputeStatus> {
  return recomputeProgress(k);
}

/**
 * POST /api/settings/recompute for a director: every unlocked canal is judged again in the
 * background, with an audit line; 202 with the progress as it stands.
 */
export async function startRecomputeAll(k: Knex, user: Pick<SessionUser, 'id' | 'role'>): Promise<Answer> {
  if (user.role !== 'director') return { status: 403, body: { error: 'Your role may not do this.' } };
  const canals = await recomputeAll(k, async (trx, n) => {
    const { version } = await readSettings(trx);
    await audit(trx, user.id, 'settings.recompute', 'settings', String(version), { canals: n });
  });
  return { status: 202, body: { canals, ...(await recomputeStatus(k)) } };
}

/** What /admin/settings shows: every setting with its words, range, default and source, and the version. */
export async function settingsPage(): Promise<{ version: number; rows: SettingRowView[] }> {
  const { version, values } = await readSettings(await db());
  const defs: Readonly<Record<string, SettingDef>> = SETTING_DEFS;
  const rows = SETTING_NAMES.map((name): SettingRowView => {
    const d = defs[name]!;
    const note = (TOLERANCE_SOURCES as Readonly<Record<string, string>>)[name];
    return {
      name,
      label: d.label ?? d.doc,
      group: settingGroup(name),
      value: values[name],
      default: d.default,
      min: d.min,
      max: d.max,
      step: settingStep(d),
      whole: d.whole,
      yesNo: isYesNo(d),
      unit: d.unit ?? '',
      range: settingRangeText(d),
      defaultText: settingValueText(d, d.default),
      source: settingSource(name),
      sourceNote: note ?? null,
    };
  });
  return { version, rows };
}
