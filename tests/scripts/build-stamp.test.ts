// `npm test` and `npm start` build through one function that stamps the build, so the next
// `npm start` after `npm test` serves the same build instead of building again.
import { mkdirSync, mkdtempSync, readFileSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { buildIsStale, stampBuild } from '../../scripts/lib/build';
import { ROOT } from '../helpers/paths';

let root: string;
afterEach(() => rmSync(root, { recursive: true, force: true }));

function fakeProject(): string {
  root = mkdtempSync(join(tmpdir(), 'coneline-stamp-'));
  mkdirSync(join(root, 'src'), { recursive: true });
  writeFileSync(join(root, 'src/page.ts'), 'export {};');
  for (const p of ['src/page.ts', 'src']) utimesSync(join(root, p), new Date('2026-01-01'), new Date('2026-01-01'));
  mkdirSync(join(root, 'dist/server'), { recursive: true });
  writeFileSync(join(root, 'dist/server/entry.mjs'), '');
  return root;
}

describe('the build stamp', () => {
  it('makes a build newer than its sources current once stamped, and stale without the stamp', () => {
    const r = fakeProject();
    expect(buildIsStale(r)).toBe(true);
    stampBuild(r);
    expect(buildIsStale(r)).toBe(false);
  });

  it('is written by the build npm test runs, not only by npm start', () => {
    const testScript = readFileSync(resolve(ROOT, 'scripts/test.ts'), 'utf8');
    expect(testScript).toMatch(/import \{ build \} from '\.\/lib\/build\.ts'/);
    expect(testScript).not.toMatch(/'astro\.js'\), 'build'\]/);
  });
});
