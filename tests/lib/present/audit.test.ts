// The audit log in words: every action the code writes has its words, and details read plainly.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { auditActionWords, auditDetailText, KNOWN_AUDIT_ACTIONS } from '../../../src/lib/present/audit';

const root = resolve(import.meta.dirname, '../../..');

function filesUnder(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? filesUnder(p) : /\.(ts|tsx|astro)$/.test(name) ? [p] : [];
  });
}

/** The top-level arguments of each call `name(…)` in `text`, as source text. */
function callArguments(text: string, name: string): string[][] {
  const calls: string[][] = [];
  for (const m of text.matchAll(new RegExp(`\\b${name}\\(`, 'g'))) {
    const args: string[] = [];
    let depth = 0;
    let current = '';
    let quote: string | null = null;
    for (let i = m.index + m[0].length; i < text.length; i++) {
      const c = text[i]!;
      if (quote) {
        if (c === quote && text[i - 1] !== '\\') quote = null;
      } else if (c === "'" || c === '"' || c === '`') quote = c;
      else if ('([{'.includes(c)) depth++;
      else if (')]}'.includes(c)) {
        if (depth === 0) break;
        depth--;
      } else if (c === ',' && depth === 0) {
        args.push(current);
        current = '';
        continue;
      }
      current += c;
    }
    args.push(current);
    calls.push(args);
  }
  return calls;
}

/** Every action code written by a call of audit(k, actor, action, …) in src/, with where. */
function writtenActions(): Map<string, string> {
  const found = new Map<string, string>();
  for (const file of filesUnder(join(root, 'src'))) {
    for (const args of callArguments(readFileSync(file, 'utf8'), 'audit')) {
      // The action is the third argument: a code, or a ternary choosing between codes.
      for (const m of (args[2] ?? '').matchAll(/'([a-z]+\.[a-z][a-z-]*)'/g))
        if (!found.has(m[1]!)) found.set(m[1]!, relative(root, file));
    }
  }
  return found;
}

describe('auditActionWords', () => {
  it('has words for every action the code writes to the audit log', () => {
    const written = writtenActions();
    expect(written.size).toBeGreaterThanOrEqual(10);
    const missing = [...written].filter(([a]) => !KNOWN_AUDIT_ACTIONS.includes(a)).map(([a, f]) => `${a} (${f})`);
    expect(missing, 'add words for these to src/lib/present/audit.ts').toEqual([]);
  });

  it('spells out an action it has no words for', () => {
    expect(auditActionWords('settings.change')).toBe('Changed the course settings');
    expect(auditActionWords('cohort.unheard-of')).toBe('Cohort unheard of');
  });
});

describe('auditDetailText', () => {
  it('shows a settings change as old → new, and other details as pairs', () => {
    expect(
      auditDetailText('settings.change', {
        fromVersion: 3,
        changes: { minAccessoryCones: { from: 3, to: 4 }, fillShortLimitMm: { from: 2, to: 1.5 } },
      }),
    ).toBe('minAccessoryCones: 3 → 4; fillShortLimitMm: 2 → 1.5');
    // Lines written before old values were kept.
    expect(auditDetailText('settings.change', { changes: { minAccessoryCones: 5 } })).toBe('minAccessoryCones: 5');
    expect(auditDetailText('case.signoff', { checkpoint: 'final', decision: 'approve' })).toBe(
      'checkpoint: final; decision: approve',
    );
    expect(auditDetailText('user.signed-out', null)).toBe('');
  });
});
