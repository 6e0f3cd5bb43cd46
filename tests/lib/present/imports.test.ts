// Server-rendered pages take their words from src/lib/present, never from the tablet's code,
// and the present module stays pure so the island and the server can both load it.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = resolve(import.meta.dirname, '../../..');
const client = join(root, 'src/lib/client');

function filesUnder(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? filesUnder(p) : /\.(astro|ts|tsx)$/.test(name) ? [p] : [];
  });
}

/** What the server runs: a .ts/.tsx file whole, an .astro file's frontmatter (its <script> runs in the browser). */
function serverSource(file: string): string {
  const text = readFileSync(file, 'utf8');
  if (!file.endsWith('.astro')) return text;
  const m = /^---\n([\s\S]*?)\n---/.exec(text);
  return m?.[1] ?? '';
}

function importsOf(source: string): string[] {
  return [
    ...source.matchAll(
      /(?:^|\n)\s*(?:import|export)\s[^'"]*?from\s+['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)/g,
    ),
  ].map((m) => (m[1] ?? m[2])!);
}

describe('server-rendered pages and components', () => {
  const dirs = ['src/pages', 'src/components/shared', 'src/components/home', 'src/components/review'];
  const files = dirs.flatMap((d) => filesUnder(join(root, d)));

  it('import nothing from src/lib/client', () => {
    const hits = files.flatMap((f) =>
      importsOf(serverSource(f))
        .filter((spec) => spec.startsWith('.') && resolve(dirname(f), spec).startsWith(client))
        .map((spec) => `${relative(root, f)} imports ${spec}`),
    );
    expect(files.length).toBeGreaterThan(10);
    expect(hits).toEqual([]);
  });

  it('would notice such an import', () => {
    expect(importsOf("import { describeEvent } from '../../lib/client/describe';")).toEqual([
      '../../lib/client/describe',
    ]);
  });
});

describe('src/lib/present', () => {
  const dir = join(root, 'src/lib/present');
  const files = filesUnder(dir);

  it('imports only its own files and the rules core, so it is pure and light', () => {
    for (const f of files) {
      for (const spec of importsOf(readFileSync(f, 'utf8'))) {
        expect(spec.startsWith('./') || spec === '../rules/core', `${relative(root, f)} imports ${spec}`).toBe(true);
      }
    }
  });

  it('uses no I/O, React or Node-only globals', () => {
    for (const f of files) {
      const src = readFileSync(f, 'utf8').replace(/\/\/.*$/gm, '');
      // `react` as a word: the audit log's words name the action user.reactivated.
      expect(src, f).not.toMatch(/\b(fetch|indexedDB|localStorage|document|window|process|require|react)\b|node:/);
    }
  });
});
