// The canal read's fast lane (src/lib/server/fast-lane.ts) answers exactly what the route
// file answers, only for an ordinary request, and hands every other one to Astro: an ended
// session, a canal the user may not read and other spellings of the path get Astro's answers.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { EventWriter } from '../helpers/events';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let mira: ApiClient;
let tomas: ApiClient;

beforeAll(async () => {
  server = await startServer();
  [mira, tomas] = await Promise.all([
    apiSignIn(server.baseUrl, DEMO.mira, DEMO.password),
    apiSignIn(server.baseUrl, DEMO.tomas, DEMO.password),
  ]);
});
afterAll(async () => {
  await server?.stop();
});

/** Mira's stored case with one canal and two steps (invented lengths). */
async function mirasCanal(): Promise<string> {
  const w = new EventWriter();
  w.open();
  const canalId = w.canal();
  w.add('seat.checked', { fileSize: '35', lengthMm: 21, result: 'seated' }, canalId);
  w.add('taper.checked', { depthMm: 20.5 }, canalId);
  const res = await mira.post('/api/sync', { deviceId: 'tablet-lane', events: w.events });
  expect(res.status).toBe(200);
  return canalId;
}

const lane = (res: Response) => res.headers.get('server-timing');

describe('GET /api/canals/{id} through the fast lane', () => {
  it('answers an ordinary read with the same status, headers that matter and body as Astro', async () => {
    const canalId = await mirasCanal();
    // Astro's own answer: a spelling its router accepts and the lane does not (a query).
    const viaAstro = await mira.fetch(`/api/canals/${canalId}?from=astro`);
    const viaLane = await mira.fetch(`/api/canals/${canalId}`);
    expect(viaAstro.status).toBe(200);
    expect(viaLane.status).toBe(200);
    expect(lane(viaAstro)).toBeNull();
    expect(lane(viaLane)).toBe('lane;desc="fast"');
    for (const h of ['content-type', 'cache-control', 'x-content-type-options', 'content-security-policy']) {
      expect(viaLane.headers.get(h), h).toBe(viaAstro.headers.get(h));
    }
    expect(await viaLane.text()).toBe(await viaAstro.text());
  });

  it("leaves another student's canal to Astro, which answers 404 as for no canal at all", async () => {
    const canalId = await mirasCanal();
    const res = await tomas.fetch(`/api/canals/${canalId}`);
    expect(res.status).toBe(404);
    expect(lane(res)).toBeNull();
    const none = await tomas.fetch(`/api/canals/${crypto.randomUUID()}`);
    expect(await res.json()).toEqual(await none.json());
  });

  it('refuses a session ended by sign-out on the very next read', async () => {
    const canalId = await mirasCanal();
    const other = await apiSignIn(server.baseUrl, DEMO.mira, DEMO.password);
    // A session's first request decodes it through Astro; the next one takes the lane.
    expect(lane(await other.fetch(`/api/canals/${canalId}`))).toBeNull();
    expect(lane(await other.fetch(`/api/canals/${canalId}`))).toBe('lane;desc="fast"');
    const signedOut = await other.fetch('/signout', {
      method: 'POST',
      headers: { Origin: server.baseUrl, 'Content-Type': 'application/x-www-form-urlencoded' },
      body: 'scope=here',
    });
    expect(signedOut.status).toBe(303);
    const after = await fetch(`${server.baseUrl}/api/canals/${canalId}`, { headers: { Cookie: other.cookie } });
    expect(after.status).toBe(401);
    expect(lane(after)).toBeNull();
  });

  it('leaves HEAD, other methods and anonymous reads to Astro', async () => {
    const canalId = await mirasCanal();
    const anon = await fetch(`${server.baseUrl}/api/canals/${canalId}`);
    expect(anon.status).toBe(401);
    expect(lane(anon)).toBeNull();
    const post = await mira.fetch(`/api/canals/${canalId}`, {
      method: 'POST',
      headers: { Origin: server.baseUrl, 'Content-Type': 'application/json' },
      body: '{}',
    });
    expect(lane(post)).toBeNull();
    expect(post.status).toBeGreaterThanOrEqual(400);
  });
});
