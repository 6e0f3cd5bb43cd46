/** Runs `npm start` or `npm run serve` (through tsx) as a test would from a shell. */
import { spawn, type ChildProcess } from 'node:child_process';
import { ROOT, TSX } from './paths';
import { freePort } from './server';

// The variables these scripts read, cleared so the machine's own environment cannot leak in.
const CLEARED = ['AUTH_SECRET', 'HOST', 'PUBLIC_HOST', 'PUBLIC_URL', 'HTTPS', 'SERVER_CERT_PATH', 'SERVER_KEY_PATH', 'TRUST_PROXY', 'ASTRO_OUT_DIR'];

export interface ScriptRun {
  /** The exit code, or null while it is still running (it is listening). */
  code: number | null;
  out: string;
  baseUrl: string;
  proc: ChildProcess;
  /** Ends it with SIGTERM, as a service manager would, and resolves to its exit code. */
  stop(): Promise<number | null>;
}

/** Starts `script` with `args` on a free port; resolves once it listens or has exited. */
export async function runScript(script: string, args: string[], env: Record<string, string>): Promise<ScriptRun> {
  const port = await freePort();
  const fullEnv: NodeJS.ProcessEnv = { ...process.env, PORT: String(port), ...env };
  for (const name of CLEARED) if (!(name in env)) delete fullEnv[name];
  let out = '';
  const proc = spawn(process.execPath, [TSX, script, ...args], { cwd: ROOT, env: fullEnv, stdio: ['ignore', 'pipe', 'pipe'] });
  proc.stdout!.on('data', (d: Buffer) => (out += d.toString()));
  proc.stderr!.on('data', (d: Buffer) => (out += d.toString()));
  // 'close' comes after all the output has been read, unlike 'exit'.
  let closed = false;
  const done = new Promise<number | null>((r) => proc.once('close', (code) => { closed = true; r(code); }));
  const deadline = Date.now() + 30_000;
  while (!out.includes('Coneline is listening') && !closed && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
  return {
    code: closed ? await done : null,
    get out() { return out; },
    baseUrl: `http://127.0.0.1:${port}`,
    proc,
    async stop() {
      if (!closed) proc.kill('SIGTERM');
      return done;
    },
  };
}
