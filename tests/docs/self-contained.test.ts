// The repository is its own spec: code, scripts, tests and docs point to docs/ or say the reason
// inline, never to a product folder beside the checkout (which a clone does not have).
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = resolve(import.meta.dirname, '../..');
const DIRS = ['src', 'scripts', 'tests', 'db', 'docs'];
const TEXT = /\.(ts|tsx|mts|mjs|js|astro|md|css|json|sql)$/;

// Spelled in pieces so that this file does not match itself.
const md = (name: string) => `${name}.md`;
const OUTSIDE = [
  'shared' + '/product',
  md('stack-notes'),
  md('conventions'),
  md('chairside-flow'),
  md('look-and-feel'),
  md('brief'),
];

function filesUnder(dir: string): string[] {
  if (!existsSync(dir)) return [];
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? filesUnder(p) : TEXT.test(name) ? [p] : [];
  });
}

/** Relative paths to a `shared` folder that leave the repository or lead nowhere in it. */
function outsideSharedPaths(file: string, text: string): string[] {
  return [...text.matchAll(/((?:\.\.\/)+)shared\b/g)]
    .map((m) => m[0])
    .filter((rel) => {
      const target = resolve(dirname(file), rel);
      return relative(root, target).startsWith('..') || !existsSync(target);
    });
}

describe('files under src, scripts, tests, db and docs', () => {
  const files = DIRS.flatMap((d) => filesUnder(join(root, d)));

  it('are found', () => {
    expect(files.length).toBeGreaterThan(100);
  });

  it('name no document of the product folder outside the repository', () => {
    const hits = files.flatMap((f) => {
      const text = readFileSync(f, 'utf8').toLowerCase();
      return OUTSIDE.filter((s) => text.includes(s.toLowerCase())).map((s) => `${relative(root, f)}: ${s}`);
    });
    expect(hits).toEqual([]);
  });

  it('reach a shared folder only inside the repository', () => {
    const hits = files.flatMap((f) =>
      outsideSharedPaths(f, readFileSync(f, 'utf8')).map((p) => `${relative(root, f)}: ${p}`),
    );
    expect(hits).toEqual([]);
  });

  it('catch a path to the product folder beside the checkout', () => {
    const probe = join(root, 'tests/lib/rules/x.test.ts');
    expect(outsideSharedPaths(probe, `new URL('${'../'.repeat(4)}shared/x.md')`)).toHaveLength(1);
    expect(outsideSharedPaths(join(root, 'src/components/chairside/x.tsx'), `from '${'../'}shared/IsoChip'`)).toEqual(
      [],
    );
  });
});
