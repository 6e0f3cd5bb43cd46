/**
 * `npm run serve`: Coneline for real use. Run as `node --import tsx`, one process, rather than
 * through the tsx command, which relays signals to a child and may SIGKILL it when the relay
 * is slow: the server this starts would then outlive it, holding the port. Migrates DB_FILE but never seeds it, refuses to
 * start while anything a real install needs is missing (scripts/lib/preflight.ts), builds
 * when needed, and runs the server entry in production mode.
 *   npm run serve [-- --no-build]    --no-build: serve dist/ as it is (a build made elsewhere)
 */
import { spawn } from 'node:child_process';
import { resolve } from 'node:path';
import { parseArgs } from 'node:util';
import { buildIfNeeded, requireBuild } from './lib/build.ts';
import { installFacts, prepareDb } from './lib/dbtasks.ts';
import { preflight } from './lib/preflight.ts';

const root = resolve(import.meta.dirname, '..');
const { values } = parseArgs({ options: { 'no-build': { type: 'boolean', default: false } }, strict: true });
const dbFile = resolve(process.env.DB_FILE ?? 'data/coneline.sqlite');
process.env.DB_FILE = dbFile;

await prepareDb(dbFile);
const facts = await installFacts(dbFile);
const problems = preflight(process.env, facts);
if (problems.length > 0) {
  console.error('Coneline will not start for real use until these are put right:');
  for (const p of problems) console.error(`  - ${p}`);
  console.error('Nothing was started. (For a demo with invented data, use npm start.)');
  process.exit(1);
}
if (facts.activeAccounts === 0) {
  console.log(
    'No account can sign in yet: make the first director with\n  npm run user:add -- --email E --name N --role director --password P',
  );
}

if (values['no-build']) requireBuild(root);
else buildIfNeeded(root);

const server = spawn(process.execPath, [resolve(root, 'scripts/server.mjs')], {
  cwd: root,
  stdio: 'inherit',
  // HOST, PORT, TRUST_PROXY, PUBLIC_HOST and the certificate paths pass through as set.
  env: { ...process.env, NODE_ENV: 'production' },
});
const stop = () => server.kill('SIGTERM');
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
server.on('exit', (code) => process.exit(code ?? 0));
