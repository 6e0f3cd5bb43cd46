// docs/settings.md lists every setting with its words, default, range and source: the table
// must say exactly what the code declares (src/lib/settings-contract.ts), no more, no less.
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  SETTING_DEFS,
  SETTING_NAMES,
  settingRangeText,
  settingSource,
  settingValueText,
} from '../../src/lib/settings-contract';

const doc = readFileSync(resolve(import.meta.dirname, '../../docs/settings.md'), 'utf8');

/** The rows of the table under "## Every setting", by setting name. */
function documented(): Map<string, string[]> {
  const section = doc.split(/^## /m).find((s) => s.startsWith('Every setting'));
  if (!section) throw new Error('docs/settings.md has no "Every setting" section');
  const rows = new Map<string, string[]>();
  for (const line of section.split('\n')) {
    const m = /^\|\s*`([A-Za-z0-9]+)`\s*\|(.*)\|\s*$/.exec(line);
    if (m)
      rows.set(
        m[1]!,
        m[2]!.split('|').map((c) => c.trim()),
      );
  }
  return rows;
}

describe('docs/settings.md, "Every setting"', () => {
  const rows = documented();

  it('names every setting of the code, and none that the code does not have', () => {
    expect([...rows.keys()].sort()).toEqual([...SETTING_NAMES].sort());
  });

  it.each(SETTING_NAMES)('gives %s the words, default, range and source of the code', (name) => {
    const d = SETTING_DEFS[name];
    expect(rows.get(name)).toEqual([
      d.label ?? d.doc,
      settingValueText(d, d.default),
      settingRangeText(d),
      settingSource(name),
    ]);
  });
});
