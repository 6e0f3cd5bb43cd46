/**
 * Requests from another loopback address (127.0.0.2, 127.0.0.3 …): the server sees a
 * different socket address, as it would a second machine, with no proxy header involved.
 */
import { request } from 'node:http';

export interface Answer {
  status: number;
  headers: Record<string, string | string[] | undefined>;
  text: string;
}

export function fromAddress(
  localAddress: string,
  url: string,
  init: { method?: string; headers?: Record<string, string>; body?: string } = {},
): Promise<Answer> {
  const u = new URL(url);
  return new Promise((resolve, reject) => {
    const req = request(
      {
        host: u.hostname,
        port: u.port,
        path: u.pathname + u.search,
        method: init.method ?? 'GET',
        headers: init.headers,
        localAddress,
      },
      (res) => {
        let text = '';
        res.on('data', (d: Buffer) => (text += d.toString()));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, text }));
      },
    );
    req.on('error', reject);
    req.end(init.body);
  });
}
