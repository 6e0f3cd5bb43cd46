/** Runs `npm start` or `npm run serve` (through tsx) as a test would from a shell. */
import { spawn, type ChildProcess } from 'node:child_process';
import { ROOT } from './paths';
import { freePort } from './server';

// The variables these scripts read, cleared so the machine's own environment cannot leak in.
const CLEARED = [
  'AUTH_SECRET',
  'HOST',
  'PUBLIC_HOST',
  'PUBLIC_URL',
  'HTTPS',
  'SERVER_CERT_PATH',
  'SERVER_KEY_PATH',
  'TRUST_PROXY',
  'ASTRO_OUT_DIR',
  'SMTP_HOST',
  'SMTP_PORT',
  'SMTP_USER',
  'SMTP_PASS',
  'SMTP_SECURE',
  'MAIL_FROM',
];

export interface ScriptRun {
  /** The exit code, or null while it is still running (it is listening). */
  code: number | null;
  out: string;
  baseUrl: string;
  proc: ChildProcess;
  /** Its exit code once it and everything it started have closed their output. */
  done: Promise<number | null>;
  /** Ends it with SIGTERM, as a service manager would, and resolves to its exit code. */
  stop(): Promise<number | null>;
}

/** Starts `node …argv` (as package.json runs the script) on a free port; resolves once it listens or has exited. */
export async function runScript(argv: string[], env: Record<string, string>): Promise<ScriptRun> {
  const port = await freePort();
  const fullEnv: NodeJS.ProcessEnv = { ...process.env, PORT: String(port), ...env };
  for (const name of CLEARED) if (!(name in env)) delete fullEnv[name];
  let out = '';
  // A process group of its own (tsx, the script, the server it starts): stop() signals all
  // of them at once, as Ctrl-C in a terminal would, so none is left holding the port.
  const proc = spawn(process.execPath, argv, {
    cwd: ROOT,
    env: fullEnv,
    stdio: ['ignore', 'pipe', 'pipe'],
    detached: true,
  });
  proc.stdout!.on('data', (d: Buffer) => (out += d.toString()));
  proc.stderr!.on('data', (d: Buffer) => (out += d.toString()));
  // 'close' comes after all the output has been read, unlike 'exit'.
  let closed = false;
  const done = new Promise<number | null>((r) =>
    proc.once('close', (code) => {
      closed = true;
      r(code);
    }),
  );
  const deadline = Date.now() + 30_000;
  while (!out.includes('Coneline is listening') && !closed && Date.now() < deadline)
    await new Promise((r) => setTimeout(r, 100));
  return {
    code: closed ? await done : null,
    get out() {
      return out;
    },
    baseUrl: `http://127.0.0.1:${port}`,
    proc,
    done,
    async stop() {
      if (closed) return done;
      const group = -proc.pid!;
      process.kill(group, 'SIGTERM');
      const stuck = setTimeout(() => {
        try {
          process.kill(group, 'SIGKILL');
        } catch {
          /* already gone */
        }
      }, 15_000);
      const code = await done;
      clearTimeout(stuck);
      return code;
    },
  };
}
