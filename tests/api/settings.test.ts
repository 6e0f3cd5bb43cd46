// The course settings through the built server (docs/settings.md): anyone signed in reads
// them, a director changes them with the version in If-Match, every value within its range,
// each change in the audit log, and the canals judged again while a signed-off case keeps its
// verdict.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  SETTING_DEFS,
  SETTING_NAMES,
  settingStep,
  type RecomputeStatus,
  type SettingName,
  type SettingsAnswer,
} from '../../src/lib/settings-contract';
import { anonymous, apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { EventWriter } from '../helpers/events';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
const as: Record<'mira' | 'helen' | 'ingrid', ApiClient> = {} as never;

beforeAll(async () => {
  server = await startServer();
  for (const who of ['mira', 'helen', 'ingrid'] as const)
    as[who] = await apiSignIn(server.baseUrl, DEMO[who], DEMO.password);
});
afterAll(async () => {
  await server?.stop();
});

const read = async (who: ApiClient = as.ingrid) => {
  const res = await who.fetch('/api/settings');
  expect(res.status).toBe(200);
  return { body: (await res.json()) as SettingsAnswer, etag: res.headers.get('etag') };
};

/** A director's PUT made to `version` (the current one unless told). */
async function put(
  values: Record<string, unknown>,
  opts: { version?: number | null; id?: string; who?: ApiClient } = {},
): Promise<{ status: number; body: Record<string, unknown>; etag: string | null }> {
  const version = opts.version === undefined ? (await read()).body.version : opts.version;
  const headers: Record<string, string> = version === null ? {} : { 'If-Match': `"${version}"` };
  const res = await (opts.who ?? as.ingrid).post(
    '/api/settings',
    { id: opts.id ?? randomUUID(), values },
    { method: 'PUT', headers },
  );
  return { status: res.status, body: (await res.json()) as Record<string, unknown>, etag: res.headers.get('etag') };
}

const auditLines = async (query: string) =>
  ((await (await as.ingrid.fetch(`/api/audit?${query}`)).json()) as { entries: { detail: unknown; actorId: number }[] })
    .entries;

describe('GET /api/settings', () => {
  it('answers every signed-in role one flat object of every setting and the version, the version as ETag', async () => {
    const answers = await Promise.all([read(as.mira), read(as.helen), read(as.ingrid)]);
    for (const { body, etag } of answers) {
      expect(Object.keys(body).sort()).toEqual(['version', ...SETTING_NAMES].sort());
      for (const n of SETTING_NAMES) expect(typeof body[n]).toBe('number');
      expect(etag).toBe(`"${body.version}"`);
      expect(body).toEqual(answers[0]!.body);
    }
  });

  it('answers 304 while the version named in If-None-Match stands, and 401 to nobody', async () => {
    const { etag } = await read(as.mira);
    const res = await as.mira.fetch('/api/settings', { headers: { 'If-None-Match': etag! } });
    expect(res.status).toBe(304);
    expect((await anonymous(server.baseUrl).fetch('/api/settings')).status).toBe(401);
  });
});

describe('PUT /api/settings', () => {
  it('refuses a student and an attending, storing nothing', async () => {
    const before = await read();
    for (const who of [as.mira, as.helen]) {
      const r = await put({ minAccessoryCones: 4 }, { who, version: before.body.version });
      expect(r.status).toBe(403);
    }
    expect((await read()).body).toEqual(before.body);
  });

  it('asks for If-Match (428) and stores nothing without it', async () => {
    const before = await read();
    const r = await put({ minAccessoryCones: 4 }, { version: null });
    expect(r.status).toBe(428);
    expect(r.body).toMatchObject({ code: 'if-match-required', error: expect.stringMatching(/If-Match/) });
    expect((await read()).body).toEqual(before.body);
  });

  it.each(SETTING_NAMES)(
    'takes %s at both ends of its range and refuses one step beyond either, naming it',
    async (name) => {
      const d = SETTING_DEFS[name as SettingName];
      const original = (await read()).body[name as SettingName];
      for (const bound of [d.min, d.max]) {
        const r = await put({ [name]: bound });
        expect(r.status, `${name} = ${bound}`).toBe(200);
        expect(r.body[name]).toBe(bound);
      }
      for (const beyond of [d.min - settingStep(d), d.max + settingStep(d)]) {
        const before = await read();
        const r = await put({ [name]: beyond });
        expect(r.status, `${name} = ${beyond}`).toBe(400);
        expect(r.body.field).toBe(name);
        expect(r.body.error).toContain(name);
        expect(r.body.error).toContain(`${d.min}`);
        expect(r.body.error).toContain(`${d.max}`);
        expect((await read()).body).toEqual(before.body);
      }
      expect((await put({ [name]: original })).status).toBe(200);
    },
  );

  it('refuses an unknown name, a number sent as text and a fraction of a whole setting, naming the field', async () => {
    const before = await read();
    const cases: [Record<string, unknown>, string][] = [
      [{ noSuchSetting: 1 }, 'noSuchSetting'],
      [{ taperShortMarginMm: '1' }, 'taperShortMarginMm'],
      [{ minAccessoryCones: 3.5 }, 'minAccessoryCones'],
      [{ requiredMolarCanals: 8, fillShortLimitMm: 9 }, 'fillShortLimitMm'],
    ];
    for (const [values, field] of cases) {
      const r = await put(values);
      expect(r.status, JSON.stringify(values)).toBe(400);
      expect(r.body.field).toBe(field);
    }
    expect((await put({})).status).toBe(400);
    expect((await read()).body).toEqual(before.body);
  });

  it('changes only the settings named, raises the version once and keeps old and new values in the audit log', async () => {
    const before = await read();
    const r = await put({ requiredPatientCanals: before.body.requiredPatientCanals + 1, cwlUnusualMarginMm: 5 });
    expect(r.status).toBe(200);
    const after = await read();
    expect(after.body).toEqual({
      ...before.body,
      version: before.body.version + 1,
      requiredPatientCanals: before.body.requiredPatientCanals + 1,
      cwlUnusualMarginMm: 5,
    });
    expect(r.body).toEqual(after.body);
    expect(r.etag).toBe(`"${after.body.version}"`);
    const me = (await (await as.ingrid.fetch('/api/me')).json()) as { id: number };
    const [line] = await auditLines(`action=settings.change&subjectType=settings&subjectId=${after.body.version}`);
    expect(line).toMatchObject({
      actorId: me.id,
      detail: {
        fromVersion: before.body.version,
        changes: {
          requiredPatientCanals: { from: before.body.requiredPatientCanals, to: before.body.requiredPatientCanals + 1 },
          cwlUnusualMarginMm: { from: before.body.cwlUnusualMarginMm, to: 5 },
        },
      },
    });
    // The same values again change nothing: no new version, no new line.
    expect((await put({ cwlUnusualMarginMm: 5 })).body.version).toBe(after.body.version);
    expect(await auditLines(`action=settings.change&subjectId=${after.body.version + 1}`)).toEqual([]);
    await put({ cwlUnusualMarginMm: before.body.cwlUnusualMarginMm });
  });

  it('refuses a change made to an older version with 409 and the current version, storing nothing', async () => {
    const loaded = (await read()).body;
    expect((await put({ minAccessoryCones: 4 }, { version: loaded.version })).status).toBe(200); // the other tab
    const now = await read();
    const stale = await put({ fallbackStopDepthMm: 11 }, { version: loaded.version });
    expect(stale.status).toBe(409);
    expect(stale.body).toMatchObject({ code: 'stale', version: now.body.version });
    expect((await read()).body).toEqual(now.body);
    await put({ minAccessoryCones: loaded.minAccessoryCones });
  });

  it('answers the same id again with the first answer, and the same id with another body with 409', async () => {
    const id = randomUUID();
    const { version } = (await read()).body;
    const first = await put({ requiredBlockCanals: 7 }, { id, version });
    expect(first.status).toBe(200);
    const again = await put({ requiredBlockCanals: 7 }, { id, version });
    expect(again).toEqual(first);
    expect((await read()).body.version).toBe(version + 1);
    expect((await put({ requiredBlockCanals: 8 }, { id, version: version + 1 })).status).toBe(409);
    expect((await put({ requiredBlockCanals: 7 }, { id, version: version + 1 })).status).toBe(409);
    expect((await read()).body.requiredBlockCanals).toBe(7);
  });
});

/** The progress, once the re-judging towards the current settings has finished. */
async function finished(): Promise<RecomputeStatus> {
  const deadline = Date.now() + 20_000;
  for (;;) {
    const res = await as.ingrid.fetch('/api/settings/recompute');
    expect(res.status).toBe(200);
    const s = (await res.json()) as RecomputeStatus;
    if (!s.running && s.finishedAt !== null && s.done === s.total) return s;
    if (Date.now() > deadline) throw new Error(`the re-judging did not finish: ${JSON.stringify(s)}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe('the re-judging after a change, and POST /api/settings/recompute', () => {
  const findings = async (canalId: string) =>
    ((await (await as.mira.fetch(`/api/canals/${canalId}`)).json()) as { findings: { code: string }[] }).findings.map(
      (f) => f.code,
    );

  /** A case of Mira's on an extracted tooth, one canal done by the book with four accessory cones. */
  async function aCase(submit: boolean) {
    const w = new EventWriter();
    w.open('extracted', 46);
    const canal = w.canal('D', 21);
    w.textbook(canal, 21, 4);
    if (submit) w.add('case.submitted', {});
    const res = await as.mira.post('/api/sync', { deviceId: 'settings-test', events: w.events });
    const answer = (await res.json()) as { results: { status: string }[]; settingsVersion: number };
    expect(answer.results.every((r) => r.status === 'stored')).toBe(true);
    expect(answer.settingsVersion).toBe((await read()).body.version);
    return { caseId: w.caseId, canal };
  }

  it('judges an unlocked canal with the new tolerance while an approved canal keeps its verdict', async () => {
    const open = await aCase(false);
    const signed = await aCase(true);
    const approve = await as.helen.post(`/api/cases/${signed.caseId}/signoffs`, {
      id: randomUUID(),
      checkpoint: 'final',
      decision: 'approve',
      expectedState: 'submitted',
    });
    expect(approve.status).toBe(201);
    expect(await findings(open.canal)).not.toContain('few-accessory-cones');
    expect(await findings(signed.canal)).not.toContain('few-accessory-cones');
    const pulled = await as.mira.fetch(`/api/cases/${open.caseId}`);
    const etag = pulled.headers.get('etag')!;
    const signedBefore = await (await as.mira.fetch(`/api/canals/${signed.canal}`)).json();

    const { version } = (await read()).body;
    expect((await put({ minAccessoryCones: 5 }, { version })).status).toBe(200);
    const status = await finished();
    expect(status.settingsVersion).toBe(version + 1);
    expect(status.startedAt).not.toBeNull();
    expect(status.finishedAt! >= status.startedAt!).toBe(true);

    expect(await findings(open.canal)).toContain('few-accessory-cones');
    expect(await (await as.mira.fetch(`/api/canals/${signed.canal}`)).json()).toEqual(signedBefore);
    // The tablet's next pull of the open case brings the new verdict and the version.
    const again = await as.mira.fetch(`/api/cases/${open.caseId}`, { headers: { 'If-None-Match': etag } });
    expect(again.status).toBe(200);
    expect(((await again.json()) as { settingsVersion: number }).settingsVersion).toBe(version + 1);

    expect((await put({ minAccessoryCones: 3 })).status).toBe(200);
    await finished();
    expect(await findings(open.canal)).not.toContain('few-accessory-cones');
  });

  it('judges every unlocked canal again on a director’s request, once per id, and shows it done', async () => {
    const id = randomUUID();
    const res = await as.ingrid.post('/api/settings/recompute', { id });
    expect(res.status).toBe(202);
    const started = (await res.json()) as RecomputeStatus & { canals: number };
    expect(started.canals).toBeGreaterThan(0);
    expect(started.total).toBe(started.canals);
    const status = await finished();
    expect(status.done).toBe(started.canals);
    expect(status.startedAt! >= started.startedAt!).toBe(true);
    const lines = await auditLines('action=settings.recompute');
    expect(lines[0]).toMatchObject({ detail: { canals: started.canals } });

    const replay = await as.ingrid.post('/api/settings/recompute', { id });
    expect(replay.status).toBe(202);
    expect(await replay.json()).toEqual(started);
    expect(await auditLines('action=settings.recompute')).toHaveLength(lines.length);
  });

  it('lets no one but a director start it or read its progress', async () => {
    for (const who of [as.mira, as.helen]) {
      expect((await who.post('/api/settings/recompute', { id: randomUUID() })).status).toBe(403);
      expect((await who.fetch('/api/settings/recompute')).status).toBe(403);
    }
  });
});
