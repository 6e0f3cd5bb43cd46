import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
const as: Record<string, ApiClient> = {};
let molarCaseId: string;

beforeAll(async () => {
  server = await startServer();
  for (const who of ['mira', 'tomas', 'helen', 'samuel', 'ingrid'] as const)
    as[who] = await apiSignIn(server.baseUrl, DEMO[who], DEMO.password);
  const list = (await (await as.mira!.fetch('/api/cases')).json()) as {
    cases: { caseId: string; tooth: number | null }[];
  };
  molarCaseId = list.cases.find((c) => c.tooth === 36)!.caseId;
});
afterAll(async () => {
  await server?.stop();
});

describe('GET /api/cases', () => {
  it("lists a student's own cases only, newest first", async () => {
    const mira = (await (await as.mira!.fetch('/api/cases')).json()) as {
      cases: { studentName: string; openedAt: string }[];
    };
    expect(mira.cases.length).toBeGreaterThan(0);
    expect(new Set(mira.cases.map((c) => c.studentName))).toEqual(new Set(['Mira Okafor']));
    const dates = mira.cases.map((c) => c.openedAt);
    expect(dates).toEqual([...dates].sort().reverse());
  });

  it("lists an attending's assigned students' cases only", async () => {
    const samuel = (await (await as.samuel!.fetch('/api/cases')).json()) as { cases: { studentName: string }[] };
    expect(new Set(samuel.cases.map((c) => c.studentName))).toEqual(new Set(['Tomas Lindqvist', 'Priya Raman']));
  });
});

describe('GET /api/cases/{caseId} and the case page', () => {
  it('gives the owner, the assigned attending and a director every event and canal of the case', async () => {
    for (const who of ['mira', 'helen', 'ingrid']) {
      const res = await as[who]!.fetch(`/api/cases/${molarCaseId}`);
      expect(res.status, who).toBe(200);
      const body = (await res.json()) as { events: unknown[]; canals: { state: { name: string } }[] };
      expect(body.canals.map((c) => c.state.name)).toEqual(['MB', 'ML', 'D']);
      expect(body.events.length).toBeGreaterThan(20);
      const page = await as[who]!.fetch(`/cases/${molarCaseId}`);
      expect(page.status).toBe(200);
      const html = await page.text();
      expect(html).toContain('D canal');
      expect(html).toContain('mandibular left first molar');
    }
  });

  it('answers 404 to another student and to an attending not assigned, as for no case at all', async () => {
    for (const who of ['tomas', 'samuel']) {
      expect((await as[who]!.fetch(`/api/cases/${molarCaseId}`)).status, who).toBe(404);
      expect((await as[who]!.fetch(`/cases/${molarCaseId}`)).status, who).toBe(404);
    }
    expect((await as.mira!.fetch('/cases/not-a-case')).status).toBe(404);
  });

  it('sends an anonymous visitor to sign in, and answers the API with 401', async () => {
    expect((await anonymous(server.baseUrl).fetch(`/cases/${molarCaseId}`)).status).toBe(302);
    expect((await anonymous(server.baseUrl).fetch(`/api/cases/${molarCaseId}`)).status).toBe(401);
  });
});

describe('GET /api/cases/{caseId}, conditional', () => {
  const note = (caseId: string, text: string) => ({
    id: randomUUID(),
    caseId,
    type: 'note.added',
    at: new Date().toISOString(),
    data: { text },
  });

  it('answers 304 with no body while the ETag still names the case, and 200 with a new ETag once it changes', async () => {
    const caseId = randomUUID();
    const opened = {
      id: randomUUID(),
      caseId,
      type: 'case.opened',
      at: new Date().toISOString(),
      data: { setting: 'block' },
    };
    expect((await as.mira!.post('/api/sync', { deviceId: 'tablet-etag', events: [opened] })).status).toBe(200);

    const first = await as.mira!.fetch(`/api/cases/${caseId}`);
    expect(first.status).toBe(200);
    const etag = first.headers.get('etag');
    expect(etag).toMatch(/^"[^"]+"$/);
    expect(first.headers.get('cache-control')).toBe('no-store');
    expect(((await first.json()) as { reviewStatus: string }).reviewStatus).toBe('open');

    const same = await as.mira!.fetch(`/api/cases/${caseId}`, { headers: { 'If-None-Match': etag! } });
    expect(same.status).toBe(304);
    expect(await same.text()).toBe('');
    expect(same.headers.get('etag')).toBe(etag);
    expect(same.headers.get('cache-control')).toBe('no-store');
    // A list of tags, or the weak form of ours, matches too (RFC 9110's weak comparison).
    const listed = await as.mira!.fetch(`/api/cases/${caseId}`, { headers: { 'If-None-Match': `"x", W/${etag}` } });
    expect(listed.status).toBe(304);

    expect(
      (await as.mira!.post('/api/sync', { deviceId: 'tablet-etag', events: [note(caseId, 'ETag check')] })).status,
    ).toBe(200);
    const changed = await as.mira!.fetch(`/api/cases/${caseId}`, { headers: { 'If-None-Match': etag! } });
    expect(changed.status).toBe(200);
    expect(changed.headers.get('etag')).not.toBe(etag);
    expect(((await changed.json()) as { events: unknown[] }).events).toHaveLength(2);
  });

  it('answers 200 to a tablet that sends no If-None-Match, as before', async () => {
    const res = await as.mira!.fetch(`/api/cases/${molarCaseId}`);
    expect(res.status).toBe(200);
    expect(res.headers.get('etag')).toBeTruthy();
  });

  it('gives no ETag and no hint to a reader who may not see the case', async () => {
    const res = await as.tomas!.fetch(`/api/cases/${molarCaseId}`, { headers: { 'If-None-Match': '*' } });
    expect(res.status).toBe(404);
    expect(res.headers.get('etag')).toBeNull();
  });
});
