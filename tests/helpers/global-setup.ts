// Runs once before all tests: makes sure there is a build, and makes the template database.
import { execFileSync } from 'node:child_process';
import { existsSync, rmSync } from 'node:fs';
import { resolve } from 'node:path';
import { ENTRY, ROOT, TEMPLATE_DB, TSX } from './paths';

export default function setup(): () => void {
  if (!existsSync(ENTRY)) {
    execFileSync(process.execPath, [resolve(ROOT, 'node_modules/astro/astro.js'), 'build'], {
      cwd: ROOT,
      stdio: 'inherit',
    });
  }
  for (const f of [TEMPLATE_DB, `${TEMPLATE_DB}-wal`, `${TEMPLATE_DB}-shm`]) rmSync(f, { force: true });
  execFileSync(process.execPath, [TSX, resolve(ROOT, 'scripts/lib/prepare-cli.ts'), TEMPLATE_DB, '--seed'], {
    cwd: ROOT,
    stdio: 'inherit',
  });
  process.env.CONELINE_TEMPLATE_DB = TEMPLATE_DB;
  return () => {
    for (const f of [TEMPLATE_DB, `${TEMPLATE_DB}-wal`, `${TEMPLATE_DB}-shm`]) rmSync(f, { force: true });
  };
}
