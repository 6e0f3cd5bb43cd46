#!/usr/bin/env node
/**
 * Coneline's own server entry: a plain node:http(s) server around the handler that Astro's
 * Node adapter builds (dist/server/entry.mjs, static files included). Owning the server lets
 * us set security headers on every response (static files and the service worker too),
 * bound how long a request may take, and decide the client's address before Astro sees it.
 * `npm start`, `npm run serve` and the tests all start this file.
 *
 * Plain JavaScript on purpose: a real install runs it with `node`, no TypeScript loader.
 */
import { readFileSync } from 'node:fs';
import { createServer as createHttp, get as httpGet } from 'node:http';
import { createServer as createHttps, get as httpsGet } from 'node:https';
import { isIP } from 'node:net';
import { resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import {
  ROUTE_TIMEOUTS,
  cameOverHttps,
  decideClientAddress,
  routeTimeoutMs,
  securityHeaders,
} from './lib/http-policy.mjs';

const root = resolve(import.meta.dirname, '..');
const env = process.env;

/** Stops the start with one plain line: a server that half-starts is worse than none. */
function refuse(message) {
  console.error(`Coneline cannot start: ${message}`);
  process.exit(1);
}

if (env.AUTH_SECRET !== undefined && env.AUTH_SECRET.length < 32) {
  refuse('AUTH_SECRET must be at least 32 characters (for example: openssl rand -hex 32).');
}
const requestTimeoutMs = Number(env.REQUEST_TIMEOUT_MS ?? 30_000);
if (!Number.isInteger(requestTimeoutMs) || requestTimeoutMs < 1000) {
  refuse('REQUEST_TIMEOUT_MS must be a whole number of milliseconds, at least 1000.');
}
const trustProxy = env.TRUST_PROXY === '1';
const publicHost = env.PUBLIC_HOST?.trim().toLowerCase() || undefined;

// The adapter's entry would start a server of its own unless told not to.
env.ASTRO_NODE_AUTOSTART = 'disabled';
const outDir = resolve(root, env.ASTRO_OUT_DIR ?? 'dist');
const { handler } = await import(pathToFileURL(resolve(outDir, 'server/entry.mjs')).href);
/** Set by the app once its middleware has loaded (src/lib/server/fast-lane.ts). */
const FAST_LANE = Symbol.for('coneline.fast-lane');

/** After a timeout has answered, whatever the handler writes later goes nowhere. */
function silence(res) {
  res.writeHead = () => res;
  res.setHeader = () => res;
  res.write = () => true;
  res.end = () => res;
}

function listener(req, res) {
  const address = decideClientAddress(req, trustProxy);
  // Astro reads the client's address from X-Forwarded-For: hand it the one we decided,
  // and drop forwarded host and scheme headers no trusted proxy vouches for.
  req.headers['x-forwarded-for'] = address;
  if (!trustProxy) {
    delete req.headers['x-forwarded-host'];
    delete req.headers['x-forwarded-proto'];
    delete req.headers['x-forwarded-port'];
  }
  const hsts = Boolean(publicHost) && cameOverHttps(req, trustProxy) && hostOf(req) === publicHost && !isIP(publicHost);
  for (const [name, value] of Object.entries(securityHeaders({ hsts }))) res.setHeader(name, value);

  const limit = routeTimeoutMs(req.url ?? '/', requestTimeoutMs);
  const timer = setTimeout(() => {
    if (res.writableEnded) return;
    if (!res.headersSent) {
      const body = JSON.stringify({
        error: 'The request took too long and was stopped; nothing more will be read. Try again.',
      });
      res.writeHead(408, { 'Content-Type': 'application/json', Connection: 'close', 'Cache-Control': 'no-store' });
      res.end(body, () => req.socket.destroy());
    } else {
      req.socket.destroy();
    }
    silence(res);
  }, limit);
  timer.unref();
  res.once('close', () => clearTimeout(timer));

  // The canal read may be answered by the app's fast lane (src/lib/server/fast-lane.ts),
  // which hands back anything it does not answer itself.
  const fast = req.url?.startsWith('/api/canals/') ? globalThis[FAST_LANE] : undefined;
  const answered = fast ? fast(req, res) : Promise.resolve(false);
  answered
    .then((done) => (done ? undefined : handler(req, res)))
    .catch((err) => {
      console.error(`[server] ${req.method} request failed: ${err?.name ?? 'Error'}`);
      if (!res.headersSent) {
        res.writeHead(500, { 'Content-Type': 'application/json', 'Cache-Control': 'no-store' });
        res.end(JSON.stringify({ error: 'The server could not answer this request.' }));
      }
    });
}

/** The Host header's name without its port, lower-cased. */
function hostOf(req) {
  const host = String(req.headers.host ?? '').toLowerCase();
  return host.startsWith('[') ? host.slice(0, host.indexOf(']') + 1) : host.split(':')[0];
}

const tls =
  env.SERVER_CERT_PATH && env.SERVER_KEY_PATH
    ? { cert: readFileSync(env.SERVER_CERT_PATH), key: readFileSync(env.SERVER_KEY_PATH) }
    : null;
const server = tls ? createHttps(tls, listener) : createHttp(listener);
// Node's own limits back ours up: headers must arrive within 20 s, a whole request within
// the longest route limit (a body shorter than its Content-Length is answered then, not never).
server.headersTimeout = 20_000;
server.requestTimeout = Math.max(requestTimeoutMs, ...ROUTE_TIMEOUTS.map((r) => r.ms)) + 5_000;
server.keepAliveTimeout = 5_000;

const host = env.HOST ?? '127.0.0.1';
const port = Number(env.PORT ?? 4321);

/** Asks our own /api/health, which opens and migrates the database and takes the data folder. */
function selfCheck(listeningPort) {
  const target = host === '0.0.0.0' || host === '::' ? '127.0.0.1' : host;
  const get = tls ? httpsGet : httpGet;
  return new Promise((resolveStatus) => {
    get(
      {
        host: target,
        port: listeningPort,
        path: '/api/health',
        rejectUnauthorized: false,
        headers: { host: 'localhost' },
      },
      (res) => {
        res.resume();
        resolveStatus(res.statusCode ?? 0);
      },
    ).on('error', () => resolveStatus(0));
  });
}

server.listen(port, host, async () => {
  const listeningPort = server.address().port;
  const status = await selfCheck(listeningPort);
  if (status !== 200) refuse('the database could not be opened (see the line above); nothing was served.');
  console.log(
    `Coneline is listening on ${tls ? 'https' : 'http'}://${host.includes(':') ? `[${host}]` : host}:${listeningPort}`,
  );
});
server.on('error', (err) => refuse(`${err.code === 'EADDRINUSE' ? `port ${port} is in use` : err.message}.`));

function stop() {
  server.close(() => process.exit(0));
  // Connections still open after a grace period are cut: a stop must not hang.
  setTimeout(() => {
    server.closeAllConnections();
    process.exit(0);
  }, 3_000).unref();
}
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
