/**
 * Reading and changing the course settings. Changing needs a director; it stores the new
 * values, raises the settings version and writes an audit line in one transaction, then
 * starts the background re-judging of unlocked canals with the new values.
 */
import type { Knex } from 'knex';
import { startRecompute } from './recompute';
import { readSettings, SETTING_DEFS, SettingsError, writeSettings, type Settings } from './settings';

export { SettingsError };

/** The settings in force, their version, and each one's range and default. */
export async function getSettings(k: Knex): Promise<Settings & { defs: typeof SETTING_DEFS }> {
  return { ...(await readSettings(k)), defs: SETTING_DEFS };
}

/** Stores `changes` for a director; throws SettingsError for anyone else or a value out of range. */
export async function changeSettings(
  k: Knex,
  user: Pick<SessionUser, 'id' | 'role'>,
  changes: Readonly<Record<string, unknown>>,
): Promise<Settings> {
  if (user.role !== 'director') throw new SettingsError('only a director may change the course settings');
  const settings = await writeSettings(k, user.id, changes);
  void startRecompute(k);
  return settings;
}
