/**
 * The local mail stand-in `npm start` runs: maildev (an npm package) on loopback, an SMTP
 * server the app sends to and a web mailbox to read what it sent. Real installs point SMTP_*
 * at the school's mail server instead (npm run serve).
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { connect, createServer } from 'node:net';
import { resolve } from 'node:path';

export interface Mailbox {
  smtpPort: number;
  webUrl: string;
  proc: ChildProcess;
}

/** `preferred` when nothing listens on it, else a free port the system picks. */
function portFor(preferred: number): Promise<number> {
  return new Promise((done) => {
    const srv = createServer();
    srv.once('error', () => {
      const any = createServer();
      any.listen(0, '127.0.0.1', () => {
        const port = (any.address() as { port: number }).port;
        any.close(() => done(port));
      });
    });
    srv.listen(preferred, '127.0.0.1', () => srv.close(() => done(preferred)));
  });
}

const listening = (port: number) =>
  new Promise<boolean>((done) => {
    const s = connect(port, '127.0.0.1');
    s.once('connect', () => {
      s.destroy();
      done(true);
    });
    s.once('error', () => done(false));
  });

/** Starts maildev on 127.0.0.1 (SMTP 1025 and web 1080 when free) and waits until it listens. */
export async function startMailbox(root: string): Promise<Mailbox> {
  const smtpPort = await portFor(1025);
  const webPort = await portFor(1080);
  const bin = resolve(root, 'node_modules/maildev/dist/bin/maildev.js');
  const args = ['--smtp', String(smtpPort), '--ip', '127.0.0.1', '--web', String(webPort), '--web-ip', '127.0.0.1'];
  const proc = spawn(process.execPath, [bin, ...args], { cwd: root, stdio: ['ignore', 'ignore', 'inherit'] });
  const deadline = Date.now() + 10_000;
  while (Date.now() < deadline && proc.exitCode === null) {
    if ((await listening(smtpPort)) && (await listening(webPort))) break;
    await new Promise((r) => setTimeout(r, 100));
  }
  return { smtpPort, webUrl: `http://127.0.0.1:${webPort}`, proc };
}
