// Review through the built server (docs/review.md, docs/lifecycle.md): every transition and
// role, and the e-mail it sends, caught by an in-process SMTP server that can be down.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { EventWriter, type WireEvent } from '../helpers/events';
import { freePort, startServer, type TestServer } from '../helpers/server';
import { testSmtp, type Received, type TestSmtp, mailEnv } from '../helpers/smtp';

let server: TestServer;
let smtp: TestSmtp;
const as: Record<string, ApiClient> = {};
const PUBLIC_URL = 'https://coneline.school.example';

beforeAll(async () => {
  smtp = testSmtp(await freePort());
  await smtp.start();
  server = await startServer({
    env: {
      ...mailEnv(smtp.port, PUBLIC_URL),
    },
  });
  for (const who of ['mira', 'tomas', 'helen', 'samuel', 'ingrid'] as const)
    as[who] = await apiSignIn(server.baseUrl, DEMO[who], DEMO.password);
});
afterAll(async () => {
  await server?.stop();
  await smtp?.stop();
});

const sync = async (events: WireEvent[]) => {
  const res = await as.mira!.post('/api/sync', { deviceId: 'review-test', events });
  expect(res.status).toBe(200);
  return ((await res.json()) as { results: { status: string; error?: string }[] }).results;
};

/** A case of Mira's, one canal (done by the book unless `fill` is false), submitted unless told not. */
async function aCase(opts: { fill?: boolean; submit?: boolean } = {}) {
  const w = new EventWriter();
  w.open('patient', 46);
  const canal = w.canal('D', 21);
  if (opts.fill !== false) w.textbook(canal);
  const submission = opts.submit === false ? null : w.add('case.submitted', {});
  expect((await sync(w.events)).every((r) => r.status === 'stored')).toBe(true);
  return { w, canal, submission };
}

const signoff = (who: string, caseId: string, body: Record<string, unknown>) =>
  as[who]!.post(`/api/cases/${caseId}/signoffs`, { id: randomUUID(), checkpoint: 'final', ...body });
const approve = (who: string, caseId: string, expectedState = 'submitted') =>
  signoff(who, caseId, { decision: 'approve', expectedState });
const giveBack = (who: string, caseId: string, expectedState = 'submitted') =>
  signoff(who, caseId, { decision: 'return', comment: 'Short in the apical third.', expectedState });
const stateOf = async (caseId: string) =>
  ((await (await as.mira!.fetch(`/api/cases/${caseId}`)).json()) as { reviewStatus: string }).reviewStatus;

const body = (m: Received) => m.raw.replace(/=\r?\n/g, '');
/** The e-mails about a case, once `count` of them have arrived (or after 10 s). */
async function mailsAbout(caseId: string, count: number): Promise<Received[]> {
  const deadline = Date.now() + 10_000;
  for (;;) {
    const found = smtp.messages.filter((m) => body(m).includes(`/cases/${caseId}`));
    if (found.length >= count || Date.now() > deadline) return found;
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe('a submitted case through /api/sync', () => {
  it('refuses a step with the reason, not to be sent again, and e-mails the assigned attending', async () => {
    const { w, canal } = await aCase();
    const [result] = await sync([w.add('note.added', { text: 'Late note' }, canal)]);
    expect(result).toMatchObject({ status: 'rejected', error: expect.stringMatching(/waiting for review/) });
    expect(result).not.toHaveProperty('retry');
    const mails = await mailsAbout(w.caseId, 1);
    expect(mails.map((m) => m.to)).toEqual([[DEMO.helen]]);
    expect(mails[0]!.subject).toMatch(/Waiting for your review: tooth 46/);
    expect(body(mails[0]!)).toContain(`${PUBLIC_URL}/cases/${w.caseId}`);
    expect(body(mails[0]!)).not.toContain('TST-0001');
  });

  it('is withdrawn until the attending acts, and not after', async () => {
    const first = await aCase();
    const [undo] = await sync([first.w.add('event.voided', { eventId: first.submission!.id, reason: 'Not done' })]);
    expect(undo!.status).toBe('stored');
    expect(await stateOf(first.w.caseId)).toBe('open');

    const second = await aCase();
    const comment = await as.helen!.post(`/api/cases/${second.w.caseId}/comments`, {
      id: randomUUID(),
      text: 'On it.',
    });
    expect(comment.status).toBe(201);
    const [late] = await sync([second.w.add('event.voided', { eventId: second.submission!.id, reason: 'Too late' })]);
    expect(late).toMatchObject({ status: 'rejected', error: expect.stringMatching(/already started reviewing/) });
    expect(await stateOf(second.w.caseId)).toBe('submitted');
  });
});

describe('POST /api/cases/{caseId}/signoffs', () => {
  it('answers 403 to the student, 404 to another student and an unassigned attending, and stores nothing', async () => {
    const { w } = await aCase();
    expect((await approve('mira', w.caseId)).status).toBe(403);
    expect((await approve('tomas', w.caseId)).status).toBe(404);
    expect((await approve('samuel', w.caseId)).status).toBe(404);
    expect(await stateOf(w.caseId)).toBe('submitted');
  });

  it('refuses a final approval with an unfilled canal, saying so', async () => {
    const { w } = await aCase({ fill: false });
    const res = await approve('helen', w.caseId);
    expect(res.status).toBe(409);
    expect(((await res.json()) as { error: string }).error).toMatch(/canal D unfilled/);
  });

  it('locks an approved case against events until it is reopened; the reopening keeps the approval, superseded', async () => {
    const { w, canal } = await aCase();
    expect((await approve('helen', w.caseId)).status).toBe(201);
    const [refused] = await sync([w.add('note.added', { text: 'After approval' }, canal)]);
    expect(refused).toMatchObject({ status: 'rejected', error: expect.stringMatching(/signed off/) });
    expect((await mailsAbout(w.caseId, 2)).map((m) => m.subject)).toContainEqual(expect.stringMatching(/^Signed off/));

    expect((await as.mira!.post(`/api/cases/${w.caseId}/reopen`, { id: randomUUID(), reason: 'x' })).status).toBe(403);
    const reopened = await as.helen!.post(`/api/cases/${w.caseId}/reopen`, {
      id: randomUUID(),
      reason: 'Missing post-op film',
    });
    expect(reopened.status).toBe(201);
    expect(await stateOf(w.caseId)).toBe('open');
    const [stored] = await sync([w.add('note.added', { text: 'After reopening' }, canal)]);
    expect(stored!.status).toBe('stored');
    const detail = (await (await as.mira!.fetch(`/api/cases/${w.caseId}`)).json()) as {
      signoffs: { decision: string; supersededAt: string | null }[];
    };
    expect(detail.signoffs.map((s) => [s.decision, s.supersededAt !== null])).toEqual([
      ['approved', true],
      ['reopened', false],
    ]);
  });

  it('answers the same id again with the first answer, and the same id with another body with 409', async () => {
    const { w } = await aCase();
    const request = {
      id: randomUUID(),
      checkpoint: 'final',
      decision: 'return',
      comment: 'Voids.',
      expectedState: 'submitted',
    };
    const first = await as.helen!.post(`/api/cases/${w.caseId}/signoffs`, request);
    const again = await as.helen!.post(`/api/cases/${w.caseId}/signoffs`, request);
    expect(first.status).toBe(201);
    expect(again.status).toBe(201);
    expect(await again.json()).toEqual(await first.json());
    const other = await as.helen!.post(`/api/cases/${w.caseId}/signoffs`, { ...request, comment: 'Other words.' });
    expect(other.status).toBe(409);
    const detail = (await (await as.helen!.fetch(`/api/cases/${w.caseId}`)).json()) as { signoffs: unknown[] };
    expect(detail.signoffs).toHaveLength(1);
  });

  it('lets one of two attendings deciding at once win; the other gets 409', async () => {
    const { w } = await aCase();
    const [a, b] = await Promise.all([giveBack('helen', w.caseId), approve('ingrid', w.caseId)]);
    expect([a.status, b.status].sort()).toEqual([201, 409]);
  });

  it('needs a comment to return, and a canal for a checkpoint', async () => {
    const { w } = await aCase();
    const noComment = await signoff('helen', w.caseId, { decision: 'return', expectedState: 'submitted' });
    expect(noComment.status).toBe(400);
    expect(((await noComment.json()) as { error: string }).error).toMatch(/return needs a comment/);
    const noCanal = await signoff('helen', w.caseId, {
      checkpoint: 'cone-fit',
      decision: 'approve',
      expectedState: 'submitted',
    });
    expect(noCanal.status).toBe(400);
  });

  it('keeps a return when the mail server is down, and e-mails it once when it is back', async () => {
    const { w, canal } = await aCase();
    await mailsAbout(w.caseId, 1); // the submission's
    await smtp.stop();
    try {
      const res = await giveBack('helen', w.caseId);
      expect(res.status).toBe(201);
      expect(await stateOf(w.caseId)).toBe('returned');
      await new Promise((r) => setTimeout(r, 800)); // a few failed tries
    } finally {
      await smtp.start();
    }
    const mails = await mailsAbout(w.caseId, 2);
    await new Promise((r) => setTimeout(r, 1000)); // time for any duplicate to arrive
    const returned = smtp.messages.filter(
      (m) => body(m).includes(`/cases/${w.caseId}`) && /^Returned/.test(m.subject ?? ''),
    );
    expect(returned).toHaveLength(1);
    expect(returned[0]!.to).toEqual([DEMO.mira]);
    expect(mails.length).toBe(2);
    // The returned case takes new events and can be submitted again.
    const results = await sync([w.add('note.added', { text: 'Put right' }, canal), w.add('case.submitted', {})]);
    expect(results.map((r) => r.status)).toEqual(['stored', 'stored']);
    expect(await stateOf(w.caseId)).toBe('submitted');
  });
});

describe('POST /api/me/mail', () => {
  it("holds an attending's notices for the daily digest once chosen, and sends each at once again when not", async () => {
    const choose = async (digest: boolean) => {
      const res = await as.helen!.post('/api/me/mail', { id: randomUUID(), digest });
      expect(res.status).toBe(200);
      expect(await (await as.helen!.fetch('/api/me/mail')).json()).toEqual({ digest });
    };
    await choose(true);
    try {
      const { w } = await aCase();
      await new Promise((r) => setTimeout(r, 1000)); // a few polls of the outbox
      // Held for tomorrow's digest (07:00 clinic time), not sent now.
      expect(await mailsAbout(w.caseId, 0)).toEqual([]);
    } finally {
      await choose(false);
    }
    const { w } = await aCase();
    expect(await mailsAbout(w.caseId, 1)).toHaveLength(1);
  });
});

describe('POST /api/cases/{caseId}/comments and the case answer', () => {
  it('takes comments from the student and the assigned attending, 404 for anyone else, and changes the ETag', async () => {
    const { w, canal } = await aCase();
    const before = (await as.mira!.fetch(`/api/cases/${w.caseId}`)).headers.get('etag');
    expect(
      (
        await as.mira!.post(`/api/cases/${w.caseId}/comments`, {
          id: randomUUID(),
          canalId: canal,
          text: 'Is it short?',
        })
      ).status,
    ).toBe(201);
    expect((await as.samuel!.post(`/api/cases/${w.caseId}/comments`, { id: randomUUID(), text: 'Hi' })).status).toBe(
      404,
    );
    const tooLong = await as.helen!.post(`/api/cases/${w.caseId}/comments`, {
      id: randomUUID(),
      text: 'x'.repeat(2001),
    });
    expect(tooLong.status).toBe(400);
    const res = await as.helen!.fetch(`/api/cases/${w.caseId}`);
    expect(res.headers.get('etag')).not.toBe(before);
    const detail = (await res.json()) as { comments: { text: string; canalId: string | null; authorRole: string }[] };
    expect(detail.comments).toEqual([
      expect.objectContaining({ text: 'Is it short?', canalId: canal, authorRole: 'student' }),
    ]);
    const list = (await (await as.helen!.fetch(`/api/cases/${w.caseId}/comments`)).json()) as { comments: unknown[] };
    expect(list.comments).toHaveLength(1);
  });
});
