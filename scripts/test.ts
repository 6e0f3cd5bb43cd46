/**
 * `npm test`: every test. Gets Debian's Chromium when it is missing (as root with apt-get),
 * type-checks, builds once, then runs the whole vitest suite against the build.
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { resolve } from 'node:path';

const root = resolve(import.meta.dirname, '..');
const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';

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
    console.error('Chromium is missing: install Debian\'s package first (sudo apt-get install -y chromium), then run npm test again.');
    process.exit(1);
  }
  console.log('Installing Debian\'s chromium for the browser tests…');
  run('apt-get', ['update', '-qq']);
  run('apt-get', ['install', '-y', '-qq', 'chromium'], { ...process.env, DEBIAN_FRONTEND: 'noninteractive' });
}

const node = process.execPath;
const bin = (p: string) => resolve(root, 'node_modules', p);
const only = process.argv.slice(2);
if (only.length === 0) run(node, [bin('astro/astro.js'), 'check']);
run(node, [bin('astro/astro.js'), 'build']);
run(node, [bin('vitest/vitest.mjs'), 'run', ...only]);
