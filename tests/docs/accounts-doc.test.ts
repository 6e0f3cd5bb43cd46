// docs/accounts.md and the case list's section of docs/sync-contract.md are the spec of the
// director's routes: every refusal code and audit action the services use is written there,
// and every parameter the case list reads is in its table.
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { CASE_LIST_PARAMS } from '../../src/lib/contract-case-list';
import { ROLE_ROUTES } from '../../src/lib/server/routes';

const root = resolve(import.meta.dirname, '../..');
const read = (p: string) => readFileSync(resolve(root, p), 'utf8');
const accountsDoc = read('docs/accounts.md');
const SERVICES = ['accounts.ts', 'cohorts.ts', 'assignments.ts'].map((f) => read(`src/lib/server/${f}`));

describe('docs/accounts.md', () => {
  it('names every refusal code the services answer', () => {
    const codes = new Set(SERVICES.flatMap((s) => [...s.matchAll(/code: '([a-z-]+)'/g)].map((m) => m[1]!)));
    expect(codes.size).toBeGreaterThanOrEqual(6);
    for (const code of codes) expect(accountsDoc, code).toContain(`\`${code}\``);
  });

  it('names every audit action the services write', () => {
    const actions = new Set(
      SERVICES.flatMap((s) => [...s.matchAll(/'((?:user|cohort|assignments)\.[a-z-]+)'/g)].map((m) => m[1]!)),
    );
    expect(actions.size).toBeGreaterThanOrEqual(10);
    for (const action of actions) expect(accountsDoc, action).toContain(`\`${action}\``);
  });

  it('describes every director-only API route it is about', () => {
    const routes = Object.keys(ROLE_ROUTES).filter((r) => /^\/api\/(users|cohorts)/.test(r));
    expect(routes.length).toBeGreaterThanOrEqual(9);
    for (const r of routes) {
      const written = r.replace('[userId]', '{userId}').replace('[cohortId]', '{cohortId}');
      const alt = written.replace('{userId}/assignments', '{studentId}/assignments');
      expect(accountsDoc.includes(written) || accountsDoc.includes(alt), r).toBe(true);
    }
  });
});

describe('the case list in docs/sync-contract.md', () => {
  it('lists exactly the parameters the query schema reads', () => {
    const contract = read('docs/sync-contract.md');
    const section = contract.slice(contract.indexOf('### The case list'), contract.indexOf('### Pulling an open case'));
    const documented = new Set(
      [...section.matchAll(/^\| `([a-zA-Z]+)`(?:, `([a-zA-Z]+)`)?/gm)].flatMap((m) => [m[1]!, ...(m[2] ? [m[2]] : [])]),
    );
    expect(documented).toEqual(new Set(CASE_LIST_PARAMS));
  });
});
