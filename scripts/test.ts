/**
 * `npm test`: every test. Gets Debian's Chromium when it is missing (as root with apt-get),
 * type-checks, builds once, then runs the whole vitest suite against the build.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import { resolve } from 'node:path';
import { build } from './lib/build.ts';
import { CHROMIUM_PATH } from './lib/chromium.ts';

const root = resolve(import.meta.dirname, '..');
const CHROMIUM = CHROMIUM_PATH;

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv = process.env): void {
  const r = spawnSync(cmd, args, { cwd: root, stdio: 'inherit', env });
  if (r.status !== 0) {
    console.error(`\n${[cmd, ...args].join(' ')} failed (exit ${r.status ?? r.signal}).`);
    process.exit(r.status ?? 1);
  }
}

if (!existsSync(CHROMIUM)) {
  const isRoot = process.getuid?.() === 0;
  const hasApt = spawnSync('sh', ['-c', 'command -v apt-get'], { stdio: 'ignore' }).status === 0;
  if (!isRoot || !hasApt) {
    console.error(
      "Chromium is missing: install Debian's package first (sudo apt-get install -y chromium), then run npm test again.",
    );
    process.exit(1);
  }
  console.log("Installing Debian's chromium for the browser tests…");
  run('apt-get', ['update', '-qq']);
  run('apt-get', ['install', '-y', '-qq', 'chromium'], { ...process.env, DEBIAN_FRONTEND: 'noninteractive' });
}

const node = process.execPath;
mkdirSync(resolve(root, 'test-results'), { recursive: true });
rmSync(resolve(root, 'test-results/vitest.json'), { force: true });
const bin = (p: string) => resolve(root, 'node_modules', p);
const only = process.argv.slice(2);
if (only.length === 0) {
  // Format and lint first: they are the quickest to fail.
  run(node, [bin('prettier/bin/prettier.cjs'), '--check', '--log-level=warn', '.']);
  run(node, [bin('eslint/bin/eslint.js'), '.']);
  run(node, [bin('astro/astro.js'), 'check']);
}
build(root);
const report = resolve(root, 'test-results/vitest.json');
const vitest = spawnSync(
  node,
  [bin('vitest/vitest.mjs'), 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`, ...only],
  { cwd: root, stdio: 'inherit' },
);
// One plain closing line that any CI can read, from vitest's own JSON report.
if (existsSync(report)) {
  const r = JSON.parse(readFileSync(report, 'utf8')) as {
    numPassedTests: number;
    numFailedTests: number;
    numPendingTests: number;
    numTodoTests: number;
  };
  console.log(
    `\n${r.numPassedTests} passed, ${r.numFailedTests} failed, ${r.numPendingTests + r.numTodoTests} skipped`,
  );
}
process.exit(vitest.status ?? 1);
