/**
 * `npm start`: migrates, seeds the demo into an empty database, builds when the sources are
 * newer than the build, and serves Coneline. No variables needed.
 */
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { networkInterfaces } from 'node:os';
import { join, resolve } from 'node:path';
import { prepareDb } from './lib/dbtasks.ts';
import { tlsEnv } from './lib/tls.ts';

const root = resolve(import.meta.dirname, '..');
const dbFile = resolve(process.env.DB_FILE ?? 'data/coneline.sqlite');
process.env.DB_FILE = dbFile;
const port = process.env.PORT ?? '4321';
const https = process.env.HTTPS === '1';
const host = process.env.HOST ?? (https ? '0.0.0.0' : '127.0.0.1');

function newest(path: string): number {
  if (!existsSync(path)) return 0;
  const st = statSync(path);
  if (!st.isDirectory()) return st.mtimeMs;
  return readdirSync(path).reduce((m, f) => Math.max(m, newest(join(path, f))), st.mtimeMs);
}

/** The addresses the origin check lets in are fixed at build time (astro.config.mjs). */
function addressStamp(): string {
  const ips = Object.values(networkInterfaces()).flat().filter((n) => n && n.family === 'IPv4').map((n) => n!.address).sort();
  return [...ips, process.env.PUBLIC_HOST ?? ''].join(',');
}

function buildIfNeeded(): void {
  const entry = resolve(root, 'dist/server/entry.mjs');
  const stampFile = resolve(root, 'dist/.coneline-build-hosts');
  const stampOk = existsSync(stampFile) && readFileSync(stampFile, 'utf8') === addressStamp();
  const built = existsSync(entry) && stampOk ? statSync(entry).mtimeMs : 0;
  const sources = Math.max(
    ...['src', 'public', 'db/migrations', 'astro.config.mjs', 'auth.config.ts', 'package-lock.json'].map((p) => newest(resolve(root, p))),
  );
  if (built > sources) return;
  console.log('Building Coneline…');
  const r = spawnSync(process.execPath, [resolve(root, 'node_modules/astro/astro.js'), 'build'], { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) process.exit(r.status ?? 1);
  writeFileSync(stampFile, addressStamp());
}

const { seeded } = await prepareDb(dbFile, { seedIfEmpty: true });
if (seeded) console.log(`Demo clinic seeded into ${dbFile}.`);
buildIfNeeded();
const tls = https ? await tlsEnv(root) : {};

const server = spawn(process.execPath, [resolve(root, 'scripts/server.mjs')], {
  cwd: root,
  stdio: 'inherit',
  // The build is a production build: React and Astro pick their fast paths from NODE_ENV.
  env: { ...process.env, ...tls, HOST: host, PORT: port, NODE_ENV: 'production' },
});
const scheme = https ? 'https' : 'http';
console.log(`Coneline: ${scheme}://localhost:${port}  (demo password: coneline-demo-2026)`);
const stop = () => server.kill('SIGTERM');
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
server.on('exit', (code) => process.exit(code ?? 0));
