/** Starts the built server (scripts/server.mjs around dist/) on a free port in a temporary folder, for tests and benchmarks. */
import { spawn, type ChildProcess } from 'node:child_process';
import { copyFileSync, existsSync, mkdtempSync, rmSync } from 'node:fs';
import { connect, createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';

const ROOT = resolve(import.meta.dirname, '../..');
const SERVER = resolve(ROOT, 'scripts/server.mjs');

export interface TestServer {
  baseUrl: string;
  dbFile: string;
  dir: string;
  /** The server's process id (benchmarks read its CPU time). */
  pid: number;
  /** Everything the server printed, for tests that look at its logs. */
  output(): string;
  stop(): Promise<void>;
}

/** True once something accepts connections on the port (the server listens when ready). */
function listening(port: number): Promise<boolean> {
  return new Promise((resolveUp) => {
    const socket = connect(port, '127.0.0.1');
    socket.once('connect', () => {
      socket.destroy();
      resolveUp(true);
    });
    socket.once('error', () => resolveUp(false));
  });
}

export function freePort(): Promise<number> {
  return new Promise((resolvePort, reject) => {
    const srv = createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const port = (srv.address() as { port: number }).port;
      srv.close(() => resolvePort(port));
    });
  });
}

/** Starts the server on a copy of `templateDb` (a migrated database), or on an empty file. */
export async function startServer(
  opts: { templateDb?: string; env?: Record<string, string>; outDir?: string } = {},
): Promise<TestServer> {
  const dir = mkdtempSync(join(tmpdir(), 'coneline-test-'));
  const dbFile = join(dir, 'coneline.sqlite');
  if (opts.templateDb) {
    if (!existsSync(opts.templateDb)) throw new Error(`the template database ${opts.templateDb} is missing`);
    copyFileSync(opts.templateDb, dbFile);
  }
  const port = await freePort();
  let log = '';
  // SERVER_NODE_ARGS, e.g. "--cpu-prof --cpu-prof-dir=/tmp/prof", for profiling a benchmark.
  const nodeArgs = (process.env.SERVER_NODE_ARGS ?? '').split(' ').filter(Boolean);
  const child: ChildProcess = spawn(process.execPath, [...nodeArgs, SERVER], {
    cwd: ROOT,
    env: {
      // Vitest sets NODE_ENV=test; the built server runs as in production.
      ...process.env,
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(port),
      DB_FILE: dbFile,
      DATA_DIR: dir,
      AUTH_SECRET: 'local-run-secret-local-run-secret-0123456789',
      ...(opts.outDir ? { ASTRO_OUT_DIR: opts.outDir } : {}),
      ...opts.env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout?.on('data', (d: Buffer) => (log += d.toString()));
  child.stderr?.on('data', (d: Buffer) => (log += d.toString()));
  const https = Boolean(opts.env?.SERVER_CERT_PATH);
  const baseUrl = `${https ? 'https' : 'http'}://127.0.0.1:${port}`;
  const deadline = Date.now() + 20_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited early:\n${log}`);
    if (await listening(port)) break;
    if (Date.now() > deadline) throw new Error(`server did not start:\n${log}`);
    await new Promise((r) => setTimeout(r, 100));
  }
  return {
    baseUrl,
    dbFile,
    dir,
    pid: child.pid!,
    output: () => log,
    async stop() {
      if (child.exitCode === null) {
        const exited = new Promise((r) => child.once('exit', r));
        child.kill('SIGTERM');
        await exited;
      }
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
