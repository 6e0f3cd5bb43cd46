/** Course settings a director may change: tolerances and graduation requirements. */
import type { Knex } from 'knex';
import { DEFAULT_TOLERANCES, type Tolerances } from '../rules/index';

async function read<T>(k: Knex, key: string): Promise<Partial<T>> {
  const row = await k('settings').select('value_json').where({ key }).first();
  if (!row) return {};
  try {
    return JSON.parse(row.value_json as string) as Partial<T>;
  } catch {
    return {};
  }
}

/** The tolerances in force: the director's values over the rules' defaults. */
export async function tolerances(k: Knex): Promise<Tolerances> {
  return { ...DEFAULT_TOLERANCES, ...(await read<Tolerances>(k, 'tolerances')) };
}

export interface Requirements {
  /** Canals to complete before graduation, by tooth group. */
  canals: { anterior: number; premolar: number; molar: number };
}

export const DEFAULT_REQUIREMENTS: Requirements = { canals: { anterior: 4, premolar: 4, molar: 6 } };

export async function requirements(k: Knex): Promise<Requirements> {
  return { ...DEFAULT_REQUIREMENTS, ...(await read<Requirements>(k, 'requirements')) };
}
