/**
 * A self-signed certificate for a demo on a local network (HTTPS=1 npm start): tablets need a
 * secure context for the service worker, Wake Lock and crypto.randomUUID.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { networkInterfaces } from 'node:os';
import { dirname, resolve } from 'node:path';
import selfsigned from 'selfsigned';
import { FILE_MODE, secureDataDir, securePrivateFile } from '../../src/lib/server/files.ts';

/** This machine's IPv4 addresses other than loopback: what a tablet on the network can reach. */
export function lanAddresses(): string[] {
  return Object.values(networkInterfaces())
    .flat()
    .filter((n) => n && n.family === 'IPv4' && !n.internal)
    .map((n) => n!.address);
}

export async function tlsEnv(root: string): Promise<Record<string, string>> {
  const dir = resolve(root, 'data/tls');
  const cert = resolve(dir, 'cert.pem');
  const key = resolve(dir, 'key.pem');
  const ips = Object.values(networkInterfaces())
    .flat()
    .filter((n) => n && n.family === 'IPv4')
    .map((n) => n!.address);
  const names = ['localhost', ...ips];
  const stamp = resolve(dir, 'names.txt');
  secureDataDir(dirname(dir));
  secureDataDir(dir);
  // Before any rewrite: writeFileSync's mode applies only when it creates the file, so a key
  // made anew over an old world-readable one would otherwise keep the old mode.
  securePrivateFile(key);
  if (!existsSync(cert) || !existsSync(stamp) || readFileSync(stamp, 'utf8') !== names.join(',')) {
    const pems = selfsigned.generate([{ name: 'commonName', value: 'Coneline demo' }], {
      days: 30,
      keySize: 2048,
      extensions: [
        {
          name: 'subjectAltName',
          altNames: names.map((n) => (/^\d/.test(n) ? { type: 7, ip: n } : { type: 2, value: n })),
        },
      ],
    });
    writeFileSync(cert, pems.cert);
    writeFileSync(key, pems.private, { mode: FILE_MODE });
    writeFileSync(stamp, names.join(','));
  }
  console.log(`HTTPS with a self-signed certificate for ${names.join(', ')} (accept it once on the tablet).`);
  return { SERVER_CERT_PATH: cert, SERVER_KEY_PATH: key };
}
