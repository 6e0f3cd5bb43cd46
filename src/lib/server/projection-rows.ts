/**
 * Row types of the tables the projection, the settings store and the background re-judging
 * keep (db/migrations/20261203000300_projection.ts), in one place so that they can move into
 * the typed data layer (`declare module 'knex/types/tables'`) as they are.
 */

/** The columns of `canals` the projection writes (besides id, case_id). */
export interface CanalDerivedRow {
  name: string;
  status: string;
  state_json: string;
  stops: number;
  cautions: number;
  notes: number;
  /** The rules version (RULES_VERSION) and settings version that judged the canal; null before. */
  rules_version: number | null;
  settings_version: number | null;
}

export interface FindingRow {
  id: number;
  canal_id: string;
  case_id: string;
  code: string;
  severity: 'stop' | 'caution' | 'note';
  event_id: string | null;
  message: string;
}

/** One raising of a finding on a canal, until it is cleared. */
export interface FindingHistoryRow {
  id: number;
  canal_id: string;
  code: string;
  event_id: string | null;
  first_raised_at: string;
  /** Null while the finding is open. */
  cleared_at: string | null;
}

/** A named number of the settings store (`value_json` holds the number as JSON). */
export interface SettingRow {
  key: string;
  value_json: string;
  updated_by: number | null;
  updated_at: string;
}

/** The single row (id 1) holding the settings version. */
export interface SettingsVersionRow {
  id: number;
  version: number;
}

/** The background re-judging of unlocked canals. */
export interface RecomputeJobRow {
  name: string;
  rules_version: number;
  settings_version: number;
  /** The last canal id done; null before the first. */
  cursor: string | null;
  finished_at: string | null;
  updated_at: string;
}
