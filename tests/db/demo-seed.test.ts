import knexFactory from 'knex';
import { describe, expect, it } from 'vitest';
import { PEOPLE } from '../../db/demo/clinic';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import { TEMPLATE_DB } from '../helpers/paths';

describe('the demo seed', () => {
  it('marks every account it makes, and its cohort, as demo', async () => {
    const k = knexFactory(sqliteOptions(TEMPLATE_DB));
    try {
      const users = (await k('users').select('email', 'demo')) as { email: string; demo: number }[];
      expect(users.map((u) => u.email).sort()).toEqual(PEOPLE.map((p) => p.email).sort());
      expect(users.every((u) => u.demo === 1)).toBe(true);
      const cohorts = (await k('cohorts').select('demo')) as { demo: number }[];
      expect(cohorts).toEqual([{ demo: 1 }]);
    } finally {
      await k.destroy();
    }
  });
});
