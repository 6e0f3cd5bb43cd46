/**
 * `npm start`: migrates, seeds the demo into an empty database, builds when the sources are
 * newer than the build, and serves Coneline. No variables needed.
 */
import { spawn } from 'node:child_process';
import { resolve } from 'node:path';
import { buildIfNeeded } from './lib/build.ts';
import { prepareDb } from './lib/dbtasks.ts';
import { tlsEnv } from './lib/tls.ts';

const root = resolve(import.meta.dirname, '..');
const dbFile = resolve(process.env.DB_FILE ?? 'data/coneline.sqlite');
process.env.DB_FILE = dbFile;
const port = process.env.PORT ?? '4321';
const https = process.env.HTTPS === '1';
const host = process.env.HOST ?? (https ? '0.0.0.0' : '127.0.0.1');

const { seeded } = await prepareDb(dbFile, { seedIfEmpty: true });
if (seeded) console.log(`Demo clinic seeded into ${dbFile}.`);
buildIfNeeded(root);
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
