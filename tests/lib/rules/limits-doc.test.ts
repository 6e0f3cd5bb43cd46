import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { LIMITS, LIMIT_MESSAGES } from '../../../src/lib/rules/index';

const contract = readFileSync(new URL('../../../docs/sync-contract.md', import.meta.url), 'utf8');

/** The "Limits" table of docs/sync-contract.md: each row names its constant and its number. */
function documentedLimits(): Record<string, number> {
  const section = contract.split(/^## /m).find((s) => s.startsWith('Limits'));
  if (!section) throw new Error('docs/sync-contract.md has no "## Limits" section');
  const rows = [...section.matchAll(/^\|[^|\n]*\(`(\w+)`\)\s*\|\s*([\d,]+)/gm)];
  return Object.fromEntries(rows.map((m) => [m[1]!, Number(m[2]!.replaceAll(',', ''))]));
}

describe('LIMITS', () => {
  it('are the numbers docs/sync-contract.md gives, every one of them and no other', () => {
    expect(documentedLimits()).toEqual({ ...LIMITS });
  });
  it('are the numbers the messages give', () => {
    for (const [limit, message] of Object.entries(LIMIT_MESSAGES))
      expect(message).toContain(` ${LIMITS[limit as keyof typeof LIMIT_MESSAGES]} `);
  });
});
