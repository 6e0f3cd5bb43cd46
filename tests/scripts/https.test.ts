import { chmodSync, readFileSync, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { get } from 'node:https';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { tlsEnv } from '../../scripts/lib/tls';
import { startServer } from '../helpers/server';

function httpsStatus(url: string, ca: string): Promise<number> {
  return new Promise((resolve, reject) => {
    get(url, { ca, servername: 'localhost' }, (res) => {
      res.resume();
      resolve(res.statusCode ?? 0);
    }).on('error', reject);
  });
}

describe('HTTPS=1 npm start', () => {
  it('serves the chairside over HTTPS with a self-signed certificate made for localhost', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'coneline-tls-'));
    try {
      const env = await tlsEnv(dir);
      const cert = readFileSync(env.SERVER_CERT_PATH!, 'utf8');
      const server = await startServer({ env });
      try {
        const port = new URL(server.baseUrl).port;
        // Verified against the certificate itself: a real chain check, not switched off.
        expect(await httpsStatus(`https://localhost:${port}/chairside`, cert)).toBe(200);
        expect(await httpsStatus(`https://localhost:${port}/signin`, cert)).toBe(200);
      } finally {
        await server.stop();
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('the self-signed certificate (scripts/lib/tls.ts)', () => {
  const mode = (path: string) => statSync(path).mode & 0o7777;

  it('keeps its private key 0600 in 0700 folders, putting wrong modes right when the key already exists', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'coneline-tls-'));
    try {
      const env = await tlsEnv(dir);
      const key = env.SERVER_KEY_PATH!;
      expect([mode(join(dir, 'data')), mode(join(dir, 'data/tls')), mode(key)]).toEqual([0o700, 0o700, 0o600]);

      // Kept as it is (the names match): the modes are still put right.
      for (const d of ['data', 'data/tls']) chmodSync(join(dir, d), 0o755);
      chmodSync(key, 0o644);
      const pem = readFileSync(key, 'utf8');
      await tlsEnv(dir);
      expect(readFileSync(key, 'utf8')).toBe(pem);
      expect([mode(join(dir, 'data')), mode(join(dir, 'data/tls')), mode(key)]).toEqual([0o700, 0o700, 0o600]);

      // Made anew over a world-readable key (the machine's addresses changed).
      writeFileSync(join(dir, 'data/tls/names.txt'), 'another-host');
      chmodSync(key, 0o644);
      await tlsEnv(dir);
      expect(readFileSync(key, 'utf8')).not.toBe(pem);
      expect(mode(key)).toBe(0o600);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
