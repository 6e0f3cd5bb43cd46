/**
 * Builds Coneline when the sources are newer than the build, or when the addresses the
 * origin check must let in have changed since (they are fixed at build time in
 * astro.config.mjs). Shared by `npm start` and `npm run serve`.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { networkInterfaces } from 'node:os';
import { join, resolve } from 'node:path';

const SOURCES = ['src', 'public', 'db/migrations', 'astro.config.mjs', 'auth.config.ts', 'package-lock.json'];

function newest(path: string): number {
  if (!existsSync(path)) return 0;
  const st = statSync(path);
  if (!st.isDirectory()) return st.mtimeMs;
  return readdirSync(path).reduce((m, f) => Math.max(m, newest(join(path, f))), st.mtimeMs);
}

/** The addresses the origin check lets in are fixed at build time (astro.config.mjs). */
function addressStamp(): string {
  const ips = Object.values(networkInterfaces())
    .flat()
    .filter((n) => n && n.family === 'IPv4')
    .map((n) => n!.address)
    .sort();
  return [...ips, process.env.PUBLIC_HOST ?? ''].join(',');
}

/** True when there is no build, it is older than a source, or it was made for other addresses. */
export function buildIsStale(root: string): boolean {
  const entry = resolve(root, 'dist/server/entry.mjs');
  const stampFile = resolve(root, 'dist/.coneline-build-hosts');
  const stampOk = existsSync(stampFile) && readFileSync(stampFile, 'utf8') === addressStamp();
  const built = existsSync(entry) && stampOk ? statSync(entry).mtimeMs : 0;
  return built <= Math.max(...SOURCES.map((p) => newest(resolve(root, p))));
}

/** Builds when the build is stale; a failed build ends the process with the build's status. */
export function buildIfNeeded(root: string): void {
  if (!buildIsStale(root)) return;
  console.log('Building Coneline…');
  build(root);
}

/**
 * Builds now and stamps the build with the addresses it lets in, so that the next
 * `npm start` after `npm test` (which builds through here too) does not build again.
 */
export function build(root: string): void {
  // The secret stays out of the build: auth-astro reads import.meta.env.AUTH_SECRET, which
  // a build can freeze into dist/; ours is read at run time instead.
  const env = { ...process.env };
  delete env.AUTH_SECRET;
  const r = spawnSync(process.execPath, [resolve(root, 'node_modules/astro/astro.js'), 'build'], {
    cwd: root,
    stdio: 'inherit',
    env,
  });
  if (r.status !== 0) process.exit(r.status ?? 1);
  stampBuild(root);
}

/** Marks the build in dist/ as made for this machine's addresses and PUBLIC_HOST. */
export function stampBuild(root: string): void {
  writeFileSync(resolve(root, 'dist/.coneline-build-hosts'), addressStamp());
}

/** For `--no-build`: go on with the build as it is, or stop when there is none. */
export function requireBuild(root: string): void {
  const entry = resolve(root, process.env.ASTRO_OUT_DIR ?? 'dist', 'server/entry.mjs');
  if (existsSync(entry)) return;
  console.error(`Coneline cannot start: --no-build, but there is no build at ${entry} (run npm run build).`);
  process.exit(1);
}
