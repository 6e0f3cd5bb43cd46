// scripts/server.mjs: headers on every response (static files too), HSTS only for the real
// host over HTTPS, time limits that answer a body shorter than its Content-Length, and a
// start refused with a short AUTH_SECRET.
import { execFile } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { request as httpRequest } from 'node:http';
import { request as httpsRequest } from 'node:https';
import { connect } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tlsEnv } from '../../scripts/lib/tls';
import { ROOT } from '../helpers/paths';
import { apiSignIn, DEMO } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
beforeAll(async () => {
  server = await startServer({ env: { REQUEST_TIMEOUT_MS: '1500' } });
});
afterAll(async () => {
  await server?.stop();
});

function scriptSrc(csp: string): string {
  return (
    csp
      .split(';')
      .map((d) => d.trim())
      .find((d) => d.startsWith('script-src')) ?? ''
  );
}

describe('headers on every response', () => {
  const asset = readdirSync(resolve(ROOT, 'dist/client/_astro')).find((f) => f.endsWith('.js'))!;
  it.each([
    '/chairside',
    '/sw.js',
    `/_astro/${asset}`,
    '/favicon.svg',
    '/manifest.webmanifest',
    '/signin',
    '/api/me',
    '/no-such-page',
  ])('%s carries a policy that forbids framing and inline scripts, and nosniff', async (path) => {
    const res = await fetch(server.baseUrl + path, { redirect: 'manual' });
    const csp = res.headers.get('content-security-policy') ?? '';
    expect(csp).toContain("frame-ancestors 'none'");
    expect(scriptSrc(csp)).toMatch(/^script-src 'self'/);
    expect(scriptSrc(csp)).not.toContain('unsafe-inline');
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    expect(res.headers.get('referrer-policy')).toBe('same-origin');
    expect(res.headers.get('strict-transport-security')).toBeNull();
  });

  it('sends the chairside the hashes of its inline scripts as a header', async () => {
    const csp = (await fetch(`${server.baseUrl}/chairside`)).headers.get('content-security-policy') ?? '';
    expect(scriptSrc(csp)).toMatch(/'sha256-/);
  });
});

/** Sends a request whose body is shorter than its Content-Length; resolves to what came back. */
function shortBody(port: number, cookie: string): Promise<{ text: string; ms: number }> {
  return new Promise((resolveAnswer, reject) => {
    const started = Date.now();
    const socket = connect(port, '127.0.0.1', () => {
      const origin = `http://127.0.0.1:${port}`;
      socket.write(
        `POST /api/sync HTTP/1.1\r\nHost: 127.0.0.1:${port}\r\nOrigin: ${origin}\r\nCookie: ${cookie}\r\n` +
          'Content-Type: application/json\r\nContent-Length: 100\r\n\r\n{"events":',
      );
    });
    let text = '';
    socket.on('data', (d) => (text += d.toString()));
    socket.on('close', () => resolveAnswer({ text, ms: Date.now() - started }));
    socket.on('error', reject);
    setTimeout(() => socket.destroy(), 15_000);
  });
}

describe('time limits', () => {
  it('answers a body shorter than its Content-Length with 408 once the limit passes', async () => {
    // A signed-in student, so that the sync route really waits for the body.
    const student = await apiSignIn(server.baseUrl, DEMO.mira, DEMO.password);
    const { text, ms } = await shortBody(Number(new URL(server.baseUrl).port), student.cookie);
    expect(text).toMatch(/^HTTP\/1\.1 408/);
    expect(ms).toBeLessThan(10_000);
  });

  it('still serves after a timed-out request', async () => {
    expect((await fetch(`${server.baseUrl}/signin`)).status).toBe(200);
  });
});

function startEntry(env: Record<string, string>): Promise<{ code: number | null; output: string }> {
  return new Promise((resolveRun) => {
    execFile(
      process.execPath,
      [resolve(ROOT, 'scripts/server.mjs')],
      { env: { ...process.env, PORT: '0', ...env }, timeout: 20_000 },
      (err, stdout, stderr) => {
        resolveRun({ code: err ? ((err as { code?: number }).code ?? 1) : 0, output: stdout + stderr });
      },
    );
  });
}

describe('starting', () => {
  it('refuses an AUTH_SECRET under 32 characters, saying why', async () => {
    const run = await startEntry({ AUTH_SECRET: 'too-short-secret' });
    expect(run.code).toBe(1);
    expect(run.output).toContain('AUTH_SECRET must be at least 32 characters');
  });

  it('refuses to serve a data folder another server holds, before anyone is served', async () => {
    // Wait until the running server has opened its database (and so holds the folder).
    expect((await fetch(`${server.baseUrl}/api/health`)).status).toBe(200);
    const run = await startEntry({ AUTH_SECRET: 'x'.repeat(40), DB_FILE: server.dbFile, DATA_DIR: server.dir });
    expect(run.code).toBe(1);
    expect(run.output).toContain('the database could not be opened');
    expect(run.output).not.toContain('Coneline is listening');
  });
});

function httpsHeaders(port: number, host: string, ca: string): Promise<Record<string, string | string[] | undefined>> {
  return new Promise((resolveHeaders, reject) => {
    const req = httpsRequest(
      { host: '127.0.0.1', port, path: '/signin', servername: 'localhost', ca, headers: { Host: host } },
      (res) => {
        res.resume();
        resolveHeaders(res.headers);
      },
    );
    req.on('error', reject);
    req.end();
  });
}

/** GET /signin over plain HTTP with the given headers (fetch will not send our own Host). */
function httpHeaders(
  baseUrl: string,
  headers: Record<string, string>,
): Promise<Record<string, string | string[] | undefined>> {
  const url = new URL('/signin', baseUrl);
  return new Promise((resolveHeaders, reject) => {
    const req = httpRequest({ host: url.hostname, port: url.port, path: url.pathname, headers }, (res) => {
      res.resume();
      resolveHeaders(res.headers);
    });
    req.on('error', reject);
    req.end();
  });
}

describe('HSTS', () => {
  it('is sent only for the public host over HTTPS, never for localhost or an address', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'coneline-hsts-'));
    const env = await tlsEnv(dir);
    const tlsServer = await startServer({ env: { ...env, PUBLIC_HOST: 'Coneline.School.example' } });
    try {
      const port = Number(new URL(tlsServer.baseUrl).port);
      const ca = readFileSync(env.SERVER_CERT_PATH!, 'utf8');
      expect((await httpsHeaders(port, 'coneline.school.example', ca))['strict-transport-security']).toMatch(
        /max-age=/,
      );
      expect((await httpsHeaders(port, `localhost:${port}`, ca))['strict-transport-security']).toBeUndefined();
      expect((await httpsHeaders(port, `127.0.0.1:${port}`, ca))['strict-transport-security']).toBeUndefined();
    } finally {
      await tlsServer.stop();
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('is not sent over plain HTTP, even for the public host and a forwarded https claim without a trusted proxy', async () => {
    const plain = await startServer({ env: { PUBLIC_HOST: 'coneline.school.example' } });
    try {
      const headers = await httpHeaders(plain.baseUrl, {
        Host: 'coneline.school.example',
        'X-Forwarded-Proto': 'https',
      });
      expect(headers['strict-transport-security']).toBeUndefined();
    } finally {
      await plain.stop();
    }
  });

  it('is sent behind a trusted proxy that says the request came over HTTPS', async () => {
    const proxied = await startServer({ env: { PUBLIC_HOST: 'coneline.school.example', TRUST_PROXY: '1' } });
    try {
      const headers = await httpHeaders(proxied.baseUrl, {
        Host: 'coneline.school.example',
        'X-Forwarded-Proto': 'https',
      });
      expect(headers['strict-transport-security']).toMatch(/max-age=/);
    } finally {
      await proxied.stop();
    }
  });
});
