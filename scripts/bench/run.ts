/** `npm run bench`: builds when needed, then runs every benchmark in this folder in turn. */
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync } from 'node:fs';
import { resolve } from 'node:path';

const here = import.meta.dirname;
const root = resolve(here, '../..');
if (!existsSync(resolve(root, 'dist/server/entry.mjs'))) {
  const b = spawnSync(process.execPath, [resolve(root, 'node_modules/astro/astro.js'), 'build'], {
    cwd: root,
    stdio: 'inherit',
  });
  if (b.status !== 0) process.exit(b.status ?? 1);
}
const only = process.argv.slice(2);
let failed = 0;
for (const file of readdirSync(here)
  .filter((f) => f.endsWith('.ts') && f !== 'run.ts')
  .sort()) {
  if (only.length > 0 && !only.some((o) => file.startsWith(o))) continue;
  console.log(`# ${file}`);
  const r = spawnSync(process.execPath, [resolve(root, 'node_modules/tsx/dist/cli.mjs'), resolve(here, file)], {
    cwd: root,
    stdio: 'inherit',
  });
  if (r.status !== 0) failed++;
}
process.exit(failed ? 1 : 0);
