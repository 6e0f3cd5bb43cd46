/**
 * `npm start`: the one-command demo. Migrates, seeds the invented demo clinic into an empty
 * database, builds when the sources are newer than the build, and serves Coneline. No
 * variables needed. Real installs use `npm run serve`, which never seeds. E-mail goes to a
 * local stand-in (maildev) with a web mailbox, whose address is printed, unless SMTP_HOST
 * names a real mail server.
 *   npm start [-- --no-build]    --no-build: serve dist/ as it is
 */
import { spawn } from 'node:child_process';
import { resolve } from 'node:path';
import { parseArgs } from 'node:util';
import { DEMO_PASSWORD } from '../db/demo/clinic.ts';
import { buildIfNeeded, requireBuild } from './lib/build.ts';
import { installFacts, prepareDb } from './lib/dbtasks.ts';
import { startMailbox, type Mailbox } from './lib/mailbox.ts';
import { lanAddresses, tlsEnv } from './lib/tls.ts';

const root = resolve(import.meta.dirname, '..');
const { values } = parseArgs({ options: { 'no-build': { type: 'boolean', default: false } }, strict: true });
const dbFile = resolve(process.env.DB_FILE ?? 'data/coneline.sqlite');
process.env.DB_FILE = dbFile;
const port = process.env.PORT ?? '4321';
const https = process.env.HTTPS === '1';
const host = process.env.HOST ?? (https ? '0.0.0.0' : '127.0.0.1');

const { seeded } = await prepareDb(dbFile, { seedIfEmpty: true });
if (seeded) console.log(`Demo clinic seeded into ${dbFile}.`);
const { activeDemoAccounts } = await installFacts(dbFile);
console.log(
  'This is the Coneline demo: npm start seeds an invented clinic, whose password is published, into an empty database.\n' +
    'For a real install use npm run serve: it never seeds, and will not start while demo accounts are active.',
);
if (values['no-build']) requireBuild(root);
else buildIfNeeded(root);
const tls = https ? await tlsEnv(root) : {};
const scheme = https ? 'https' : 'http';

// Review notices go to the local mailbox unless a real mail server is named.
const mailbox: Mailbox | null = process.env.SMTP_HOST?.trim() ? null : await startMailbox(root);
const mailEnv = mailbox
  ? { SMTP_HOST: '127.0.0.1', SMTP_PORT: String(mailbox.smtpPort), SMTP_SECURE: '', SMTP_USER: '', SMTP_PASS: '' }
  : {};

const server = spawn(process.execPath, [resolve(root, 'scripts/server.mjs')], {
  cwd: root,
  stdio: 'inherit',
  // The build is a production build: React and Astro pick their fast paths from NODE_ENV.
  env: {
    ...process.env,
    ...tls,
    ...mailEnv,
    PUBLIC_URL: process.env.PUBLIC_URL ?? `${scheme}://localhost:${port}`,
    HOST: host,
    PORT: port,
    NODE_ENV: 'production',
  },
});
const password = activeDemoAccounts > 0 ? `  (demo password: ${DEMO_PASSWORD})` : '';
console.log(`Coneline: ${scheme}://localhost:${port}${password}`);
if (mailbox) console.log(`Mailbox (e-mail Coneline sends, kept by the local stand-in): ${mailbox.webUrl}`);
else console.log(`E-mail goes to the mail server SMTP_HOST=${process.env.SMTP_HOST} names.`);
if (https) {
  // What to type on the tablet: this machine's addresses on the local network.
  const lan = lanAddresses();
  if (lan.length > 0)
    console.log(`On a tablet on this network open: ${lan.map((a) => `https://${a}:${port}/chairside`).join('  or  ')}`);
  else console.log('No local network address was found: connect this machine to the network the tablet is on.');
  console.log(
    'The tablet must trust data/tls/cert.pem (install it as a trusted certificate) for the chairside to open offline;\n' +
      'clicking through the browser warning gives the chairside online only (see the README, "On a tablet").',
  );
}
const stop = () => server.kill('SIGTERM');
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
server.on('exit', (code) => {
  mailbox?.proc.kill('SIGTERM');
  process.exit(code ?? 0);
});
