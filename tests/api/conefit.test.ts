// The cone fit at the chair through the built server (docs/review.md, "Cone fit at the
// chair"): the request and its e-mail, the approval at the chair and whom it may name, the
// stop a sign-off opens or clears with no event from the tablet, and the pull that carries it.
import { randomUUID } from 'node:crypto';
import knexFactory, { type Knex } from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { EventWriter, type WireEvent } from '../helpers/events';
import { freePort, startServer, type TestServer } from '../helpers/server';
import { testSmtp, type Received, type TestSmtp, mailEnv } from '../helpers/smtp';

let server: TestServer;
let smtp: TestSmtp;
let k: Knex;
const as: Record<string, ApiClient> = {};
const ids: Record<string, number> = {};
const PUBLIC_URL = 'https://coneline.school.example';

beforeAll(async () => {
  smtp = testSmtp(await freePort());
  await smtp.start();
  server = await startServer({
    env: {
      ...mailEnv(smtp.port, PUBLIC_URL),
    },
  });
  k = knexFactory(sqliteOptions(server.dbFile));
  for (const who of ['mira', 'tomas', 'helen', 'samuel'] as const) {
    as[who] = await apiSignIn(server.baseUrl, DEMO[who], DEMO.password);
    ids[who] = ((await k('users').where({ email: DEMO[who] }).first('id')) as { id: number }).id;
  }
});
afterAll(async () => {
  await k?.destroy();
  await server?.stop();
  await smtp?.stop();
});

/** Sets the course setting as a director's change would (a new settings version). */
async function requireApproval(on: boolean): Promise<void> {
  await k('settings')
    .insert({ key: 'requireConeFitApproval', value_json: JSON.stringify(on ? 1 : 0) })
    .onConflict('key')
    .merge();
  await k('settings_version').where({ id: 1 }).increment('version', 1);
}

const sync = async (who: string, events: WireEvent[]) => {
  const res = await as[who]!.post('/api/sync', { deviceId: 'conefit-test', events });
  expect(res.status).toBe(200);
  return ((await res.json()) as { results: { status: string; error?: string; retry?: boolean }[] }).results;
};

/** A patient case of `who`'s, one canal (D) prepared up to its cone-fit radiograph. */
function upToConeFit(): { w: EventWriter; canal: string } {
  const w = new EventWriter();
  w.open('patient', 46);
  const canal = w.canal('D', 21);
  w.add('seat.checked', { fileSize: '35', lengthMm: 21, result: 'seated' }, canal);
  w.add('taper.checked', { spreader: 'MF', depthMm: 20 }, canal);
  w.add('radiograph.taken', { purpose: 'maf' }, canal);
  w.add('canal.rinsed', { solutions: ['naocl', 'edta'] }, canal);
  w.add('canal.dried', { pointSize: 'medium', measuredMm: 21 }, canal);
  w.add('master.fitted', { size: '35', lengthMm: 21, reachedLength: true }, canal);
  w.add('radiograph.taken', { purpose: 'cone-fit' }, canal);
  return { w, canal };
}

const coneFit = (who: string, caseId: string, canalId: string, decision: 'approve' | 'return', comment?: string) =>
  as[who]!.post(`/api/cases/${caseId}/signoffs`, {
    id: randomUUID(),
    checkpoint: 'cone-fit',
    canalId,
    decision,
    ...(comment ? { comment } : {}),
    expectedState: 'open',
  });

interface CaseAnswer {
  reviewStatus: string;
  canals: { canalId: string; findings: { code: string; severity: string; eventId?: string }[] }[];
  signoffs: {
    checkpoint: string;
    canalId: string | null;
    decision: string;
    comment: string | null;
    ratings: unknown;
    attendingId: number;
    attendingName: string;
    at: string;
  }[];
  comments: unknown[];
}
const readCase = async (caseId: string) => (await (await as.mira!.fetch(`/api/cases/${caseId}`)).json()) as CaseAnswer;
const stopsOf = async (caseId: string) =>
  (await readCase(caseId)).canals.flatMap((c) => c.findings.filter((f) => f.code === 'cone-fit-not-approved'));

const body = (m: Received) => m.raw.replace(/=\r?\n/g, '');
/** The cone-fit e-mails (subject "Cone fit to check") sent to `to`, once `count` have arrived (or after 10 s). */
async function coneFitMails(to: string, count: number, waitMs = 10_000): Promise<Received[]> {
  const deadline = Date.now() + waitMs;
  for (;;) {
    const found = smtp.messages.filter((m) => m.to.includes(to) && /^Cone fit to check/.test(m.subject ?? ''));
    if (found.length >= count || Date.now() > deadline) return found;
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe('conefit.requested through /api/sync', () => {
  it('e-mails the assigned attending the tooth, the date and the queue, never the chart number', async () => {
    const before = (await coneFitMails(DEMO.helen, 0)).length;
    const { w, canal } = upToConeFit();
    w.add('conefit.requested', {}, canal);
    expect((await sync('mira', w.events)).every((r) => r.status === 'stored')).toBe(true);
    const mails = await coneFitMails(DEMO.helen, before + 1);
    expect(mails).toHaveLength(before + 1);
    const mail = mails.at(-1)!;
    expect(mail.subject).toMatch(/^Cone fit to check: tooth 46 \(patient\), /);
    expect(body(mail)).toContain(`${PUBLIC_URL}/review`);
    expect(body(mail)).toContain('canal D');
    expect(body(mail)).toContain('Mira Okafor');
    expect(body(mail)).not.toContain('TST-0001');
    expect(body(mail)).not.toContain(`/cases/${w.caseId}`);
    // Sending the same batch again stores nothing and e-mails nobody again.
    expect((await sync('mira', w.events)).every((r) => r.status === 'duplicate')).toBe(true);
    await new Promise((r) => setTimeout(r, 800));
    expect(await coneFitMails(DEMO.helen, 0)).toHaveLength(before + 1);
  });

  it('holds the notice of an attending who takes the daily digest, and sends the other at once', async () => {
    const choose = async (digest: boolean) =>
      expect((await as.samuel!.post('/api/me/mail', { id: randomUUID(), digest })).status).toBe(200);
    await choose(true);
    try {
      const helenBefore = (await coneFitMails(DEMO.helen, 0)).length;
      const { w, canal } = upToConeFit();
      w.add('conefit.requested', {}, canal);
      expect((await sync('tomas', w.events)).every((r) => r.status === 'stored')).toBe(true);
      expect(await coneFitMails(DEMO.helen, helenBefore + 1)).toHaveLength(helenBefore + 1);
      const rows = (await k('mail_outbox')
        .where({ case_id: w.caseId, kind: 'conefit' })
        .select('recipient_id', 'status')) as {
        recipient_id: number;
        status: string;
      }[];
      expect(rows.find((r) => r.recipient_id === ids.samuel)?.status).toBe('held');
      expect(await coneFitMails(DEMO.samuel, 1, 1000)).toEqual([]);
    } finally {
      await choose(false);
    }
  });

  it('e-mails nobody for a request the same batch withdrew', async () => {
    const before = (await coneFitMails(DEMO.helen, 0)).length;
    const { w, canal } = upToConeFit();
    const req = w.add('conefit.requested', {}, canal);
    w.add('event.voided', { eventId: req.id, reason: 'Undone on the tablet' }, canal);
    expect((await sync('mira', w.events)).every((r) => r.status === 'stored')).toBe(true);
    expect(await k('mail_outbox').where({ case_id: w.caseId })).toEqual([]);
    expect(await coneFitMails(DEMO.helen, 0)).toHaveLength(before);
  });
});

describe('conefit.approvedAtChair through /api/sync', () => {
  it('is refused, not to be sent again, naming an attending not assigned to the student, whoever it names', async () => {
    const { w, canal } = upToConeFit();
    expect((await sync('mira', w.events)).every((r) => r.status === 'stored')).toBe(true);
    const others = [String(ids.samuel), String(ids.tomas), '999999'];
    const results = await sync(
      'mira',
      others.map((attendingId) => w.add('conefit.approvedAtChair', { attendingId }, canal)),
    );
    for (const r of results) {
      expect(r).toMatchObject({
        status: 'rejected',
        error: expect.stringMatching(/^attendingId must name an attending assigned to you/),
      });
      expect(r).not.toHaveProperty('retry');
    }
    expect(new Set(results.map((r) => r.error)).size).toBe(1);
    const stored = await k('events').where({ case_id: w.caseId, type: 'conefit.approvedAtChair' });
    expect(stored).toEqual([]);
  });

  it('is stored naming an assigned attending, its id as a string or a number', async () => {
    const { w, canal } = upToConeFit();
    w.add('conefit.approvedAtChair', { attendingId: String(ids.helen) }, canal);
    w.add('conefit.approvedAtChair', { attendingId: ids.helen }, canal);
    expect((await sync('mira', w.events)).map((r) => r.status)).toEqual(w.events.map(() => 'stored'));
    const stored = (await k('events')
      .where({ case_id: w.caseId, type: 'conefit.approvedAtChair' })
      .select('data_json')) as { data_json: string }[];
    expect(stored.map((r) => JSON.parse(r.data_json))).toEqual([
      { attendingId: String(ids.helen) },
      { attendingId: String(ids.helen) },
    ]);
  });

  it('is refused with a reason for a body that does not read', async () => {
    const { w, canal } = upToConeFit();
    const results = await sync('mira', [
      ...w.events,
      w.add('conefit.approvedAtChair', { attendingId: 'helen' }, canal),
    ]);
    expect(results.at(-1)).toMatchObject({
      status: 'rejected',
      error: expect.stringMatching(/attendingId must be the id of a user/),
    });
  });
});

describe('cone-fit-not-approved through the sign-offs', () => {
  it('is raised at a sealing with no approval only while the setting is on', async () => {
    await requireApproval(false);
    const off = upToConeFit();
    off.w.add('master.seated', { sealer: 'epoxy-resin' }, off.canal);
    await sync('mira', off.w.events);
    expect(await stopsOf(off.w.caseId)).toEqual([]);

    await requireApproval(true);
    try {
      const on = upToConeFit();
      const seat = on.w.add('master.seated', { sealer: 'epoxy-resin' }, on.canal);
      await sync('mira', on.w.events);
      expect(await stopsOf(on.w.caseId)).toEqual([
        expect.objectContaining({ code: 'cone-fit-not-approved', severity: 'stop', eventId: seat.id }),
      ]);
      // An approval after the sealing leaves the stop on the record.
      expect((await coneFit('helen', on.w.caseId, on.canal, 'approve')).status).toBe(201);
      expect(await stopsOf(on.w.caseId)).toHaveLength(1);
    } finally {
      await requireApproval(false);
    }
  });

  it('opens when the attending disputes an approval at the chair and clears when they confirm it, with no tablet event', async () => {
    await requireApproval(true);
    try {
      const { w, canal } = upToConeFit();
      w.add('conefit.approvedAtChair', { attendingId: String(ids.helen) }, canal);
      w.add('master.seated', { sealer: 'epoxy-resin' }, canal);
      await sync('mira', w.events);
      expect(await stopsOf(w.caseId)).toEqual([]);
      const events = (await k('events').where({ case_id: w.caseId }).count({ n: '*' }))[0]!.n;

      const res = await as.mira!.fetch(`/api/cases/${w.caseId}`);
      const etag = res.headers.get('etag')!;
      const unchanged = await as.mira!.fetch(`/api/cases/${w.caseId}`, { headers: { 'If-None-Match': etag } });
      expect(unchanged.status).toBe(304);

      const dispute = await coneFit(
        'helen',
        w.caseId,
        canal,
        'return',
        'I did not see this cone: show me the radiograph.',
      );
      expect(dispute.status).toBe(201);
      const pulled = await as.mira!.fetch(`/api/cases/${w.caseId}`, { headers: { 'If-None-Match': etag } });
      expect(pulled.status).toBe(200);
      expect(pulled.headers.get('etag')).not.toBe(etag);
      const after = (await pulled.json()) as CaseAnswer;
      expect(after.canals[0]!.findings.map((f) => f.code)).toContain('cone-fit-not-approved');
      expect(after.signoffs).toEqual([
        expect.objectContaining({
          checkpoint: 'cone-fit',
          canalId: canal,
          decision: 'returned',
          comment: 'I did not see this cone: show me the radiograph.',
          ratings: null,
          attendingId: ids.helen,
          attendingName: 'Dr Helen Vasquez',
          at: expect.any(String),
        }),
      ]);
      expect(after).toHaveProperty('comments');

      expect((await coneFit('helen', w.caseId, canal, 'approve')).status).toBe(201);
      expect(await stopsOf(w.caseId)).toEqual([]);
      expect((await k('events').where({ case_id: w.caseId }).count({ n: '*' }))[0]!.n).toBe(events);
      const history = await k('finding_history')
        .where({ canal_id: canal, code: 'cone-fit-not-approved' })
        .select('cleared_at');
      expect(history).toHaveLength(1);
      expect(history[0]!.cleared_at).not.toBeNull();
    } finally {
      await requireApproval(false);
    }
  });

  it('is refused to the student and to an unassigned attending, storing nothing', async () => {
    const { w, canal } = upToConeFit();
    w.add('conefit.requested', {}, canal);
    await sync('mira', w.events);
    expect((await coneFit('mira', w.caseId, canal, 'approve')).status).toBe(403);
    expect((await coneFit('samuel', w.caseId, canal, 'approve')).status).toBe(404);
    expect((await readCase(w.caseId)).signoffs).toEqual([]);
  });
});

describe('GET /api/me', () => {
  it("tells a student their attendings and whether the cone fit must be approved; nobody else's", async () => {
    await requireApproval(true);
    try {
      const mira = (await (await as.mira!.fetch('/api/me')).json()) as Record<string, unknown>;
      expect(mira).toMatchObject({
        contractVersion: 3,
        attendings: [{ id: ids.helen, name: 'Dr Helen Vasquez' }],
        requireConeFitApproval: true,
      });
      const tomas = (await (await as.tomas!.fetch('/api/me')).json()) as { attendings: { name: string }[] };
      expect(tomas.attendings.map((a) => a.name)).toEqual(['Dr Helen Vasquez', 'Dr Samuel Osei']);
      const helen = (await (await as.helen!.fetch('/api/me')).json()) as { attendings: unknown[] };
      expect(helen.attendings).toEqual([]);
    } finally {
      await requireApproval(false);
    }
    expect(
      ((await (await as.mira!.fetch('/api/me')).json()) as { requireConeFitApproval: boolean }).requireConeFitApproval,
    ).toBe(false);
  });
});
