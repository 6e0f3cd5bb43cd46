import { readFileSync, mkdtempSync, rmSync } from 'node:fs';
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
