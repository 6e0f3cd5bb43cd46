// Review in-process (docs/review.md, docs/lifecycle.md): the submitted case's refusals and its
// withdrawal, sign-offs, reopening, comments, and the e-mail each writes to the outbox.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { caseVersion } from '../../../src/lib/server/cases';
import { addComment } from '../../../src/lib/server/comments';
import { reopen, signOff } from '../../../src/lib/server/reviews';
import type { SignoffInput } from '../../../src/lib/server/review-bodies';
import { ingestBatch } from '../../../src/lib/server/sync';
import { EventWriter } from '../../helpers/events';
import { syncDb, type SyncDb } from '../../helpers/sync-db';

let db: SyncDb;
let helen: SessionUser;
let samuel: SessionUser;
let ingrid: SessionUser;
let ana: SessionUser;

async function user(email: string, name: string, role: Role): Promise<SessionUser> {
  const [row] = await db.k('users').insert({ email, name, role }).returning('id');
  return { id: row!.id, email, name, role };
}

beforeAll(async () => {
  db = await syncDb();
  ana = { id: db.ana, email: 'ana@test.example', name: 'ana@test.example', role: 'student' };
  helen = await user('helen@test.example', 'Helen Attending', 'attending');
  samuel = await user('samuel@test.example', 'Samuel Attending', 'attending');
  ingrid = await user('ingrid@test.example', 'Ingrid Director', 'director');
  await db.k('assignments').insert({ attending_id: helen.id, student_id: db.ana });
});
afterAll(async () => {
  await db.close();
});

/** A case of Ana's with one canal done by the book, sent; `submit` adds a submission. */
async function aCase(opts: { submit?: boolean; fill?: boolean } = {}) {
  const w = new EventWriter();
  w.open('patient', 36);
  const canal = w.canal('D', 21);
  if (opts.fill !== false) w.textbook(canal);
  const submission = opts.submit === false ? null : w.add('case.submitted', {});
  const answer = await ingestBatch(db.k, db.ana, 'tablet', w.events);
  expect(answer.results.filter((r) => r.status !== 'stored')).toEqual([]);
  return { w, canal, submission };
}

const stateOf = async (caseId: string) => (await db.k('cases').where({ id: caseId }).first())!.review_status;
const outbox = (caseId: string) => db.k('mail_outbox').where({ case_id: caseId }).orderBy('created_at');
const final = (decision: 'approve' | 'return', expectedState: SignoffInput['expectedState'] = 'submitted') =>
  ({
    id: randomUUID(),
    checkpoint: 'final',
    decision,
    expectedState,
    ...(decision === 'return' ? { comment: 'The fill is short in the apical third; put it right.' } : {}),
  }) as SignoffInput;

describe('a submitted case', () => {
  it('refuses a step with a reason the student can act on, and stores nothing', async () => {
    const { w, canal } = await aCase();
    const step = w.add('note.added', { text: 'One more note' }, canal);
    const answer = await ingestBatch(db.k, db.ana, 'tablet', [step]);
    expect(answer.results[0]).toMatchObject({
      status: 'rejected',
      error: expect.stringMatching(/waiting for review.*withdraw the submission/),
    });
    expect(answer.results[0]).not.toHaveProperty('retry');
    expect(await db.k('events').where({ id: step.id })).toHaveLength(0);
  });

  it('is withdrawn by voiding its submission, back to open, and then takes steps again', async () => {
    const { w, canal, submission } = await aCase();
    const voided = w.add('event.voided', { eventId: submission!.id, reason: 'Not finished yet' });
    expect((await ingestBatch(db.k, db.ana, 'tablet', [voided])).results[0]!.status).toBe('stored');
    expect(await stateOf(w.caseId)).toBe('open');
    const step = w.add('note.added', { text: 'Now it takes this' }, canal);
    expect((await ingestBatch(db.k, db.ana, 'tablet', [step])).results[0]!.status).toBe('stored');
  });

  it('takes a step recorded after a withdrawal in the same batch', async () => {
    const { w, canal, submission } = await aCase();
    const voided = w.add('event.voided', { eventId: submission!.id, reason: 'Forgot a note' });
    const step = w.add('note.added', { text: 'The note' }, canal);
    const answer = await ingestBatch(db.k, db.ana, 'tablet', [voided, step]);
    expect(answer.results.map((r) => r.status)).toEqual(['stored', 'stored']);
    expect(await stateOf(w.caseId)).toBe('open');
  });

  it('refuses the withdrawal once the attending acted on the submission (a comment)', async () => {
    const { w, submission } = await aCase();
    const c = await addComment(db.k, helen, w.caseId, { id: randomUUID(), text: 'Looking at it now.' });
    expect(c.status).toBe(201);
    const voided = w.add('event.voided', { eventId: submission!.id, reason: 'Too late' });
    const answer = await ingestBatch(db.k, db.ana, 'tablet', [voided]);
    expect(answer.results[0]).toMatchObject({
      status: 'rejected',
      error: expect.stringMatching(/already started reviewing/),
    });
    expect(await stateOf(w.caseId)).toBe('submitted');
  });

  it('still lets the student withdraw after a comment of their own', async () => {
    const { w, submission } = await aCase();
    expect((await addComment(db.k, ana, w.caseId, { id: randomUUID(), text: 'A question for you' })).status).toBe(201);
    const voided = w.add('event.voided', { eventId: submission!.id, reason: 'I will fix it first' });
    expect((await ingestBatch(db.k, db.ana, 'tablet', [voided])).results[0]!.status).toBe('stored');
  });

  it('writes one e-mail to each assigned attending in the submission transaction, with tooth, date and link but no chart number', async () => {
    const { w } = await aCase();
    const mails = await outbox(w.caseId);
    expect(mails.map((m) => [m.recipient_id, m.kind, m.status])).toEqual([[helen.id, 'submitted', 'pending']]);
    expect(mails[0]!.subject).toMatch(/tooth 36/);
    expect(mails[0]!.body_text).toContain(`/cases/${w.caseId}`);
    expect(mails[0]!.body_text).not.toContain('TST-0001');
    expect(mails[0]!.subject).not.toContain('TST-0001');
  });
});

describe('signOff', () => {
  it('answers 404 to an unassigned attending and 403 to the case student', async () => {
    const { w } = await aCase();
    expect((await signOff(db.k, samuel, w.caseId, final('approve'))).status).toBe(404);
    expect((await signOff(db.k, ana, w.caseId, final('approve'))).status).toBe(403);
    expect(await db.k('signoffs').where({ case_id: w.caseId })).toHaveLength(0);
  });

  it('approves a clean submitted case, locking it, with an audit line and an e-mail to the student', async () => {
    const { w, canal } = await aCase();
    const input = { ...final('approve'), ratings: { [canal]: { fillLength: 4, density: 3 } } } as SignoffInput;
    const answer = await signOff(db.k, helen, w.caseId, input);
    expect(answer).toMatchObject({
      status: 201,
      body: { reviewStatus: 'approved', signoff: { decision: 'approved' } },
    });
    expect(await stateOf(w.caseId)).toBe('approved');
    expect(await db.k('audit_log').where({ action: 'case.signoff', subject_id: w.caseId })).toHaveLength(1);
    expect((await outbox(w.caseId)).map((m) => [m.recipient_id, m.kind])).toContainEqual([db.ana, 'approved']);
    const step = w.add('note.added', { text: 'After sign-off' }, canal);
    expect((await ingestBatch(db.k, db.ana, 'tablet', [step])).results[0]).toMatchObject({
      error: expect.stringMatching(/signed off; ask your attending to reopen/),
    });
  });

  it('refuses a final approval with an unfilled canal, naming it, and stores nothing', async () => {
    const { w } = await aCase({ fill: false });
    const answer = await signOff(db.k, helen, w.caseId, final('approve'));
    expect(answer).toMatchObject({
      status: 409,
      body: { code: 'open-problems', error: expect.stringMatching(/canal D unfilled/) },
    });
    expect(await db.k('signoffs').where({ case_id: w.caseId })).toHaveLength(0);
    expect(await stateOf(w.caseId)).toBe('submitted');
  });

  it('refuses a final approval with an open stop', async () => {
    const { w } = await aCase();
    await db.k('canals').where({ case_id: w.caseId }).update({ stops: 1 });
    const answer = await signOff(db.k, ingrid, w.caseId, final('approve'));
    expect(answer).toMatchObject({ status: 409, body: { error: expect.stringMatching(/1 open stop/) } });
  });

  it('answers 409 to the second of two attendings deciding on the state they both saw', async () => {
    const { w } = await aCase();
    const [a, b] = await Promise.all([
      signOff(db.k, helen, w.caseId, final('return')),
      signOff(db.k, ingrid, w.caseId, final('approve')),
    ]);
    expect([a.status, b.status].sort()).toEqual([201, 409]);
    expect((a.status === 409 ? a : b).body).toMatchObject({ code: 'state-changed' });
    expect(await db.k('signoffs').where({ case_id: w.caseId })).toHaveLength(1);
  });

  it('returns a case with a comment; the student works on and submits again', async () => {
    const { w, canal } = await aCase();
    expect((await signOff(db.k, helen, w.caseId, final('return'))).status).toBe(201);
    expect(await stateOf(w.caseId)).toBe('returned');
    expect((await outbox(w.caseId)).map((m) => m.kind)).toContain('returned');
    const step = w.add('note.added', { text: 'Put it right' }, canal);
    const again = w.add('case.submitted', {});
    const answer = await ingestBatch(db.k, db.ana, 'tablet', [step, again]);
    expect(answer.results.map((r) => r.status)).toEqual(['stored', 'stored']);
    expect(await stateOf(w.caseId)).toBe('submitted');
  });

  it('keeps checkpoint sign-offs independent of the case state and of each other', async () => {
    const { w, canal } = await aCase({ submit: false });
    const cone = {
      id: randomUUID(),
      checkpoint: 'cone-fit',
      canalId: canal,
      decision: 'approve',
      expectedState: 'open',
    };
    const fill = { ...cone, id: randomUUID(), checkpoint: 'fill-check', decision: 'return', comment: 'Voids.' };
    expect((await signOff(db.k, helen, w.caseId, fill as SignoffInput)).status).toBe(201);
    expect((await signOff(db.k, helen, w.caseId, cone as SignoffInput)).status).toBe(201);
    expect(await stateOf(w.caseId)).toBe('open');
    expect(await db.k('signoffs').where({ case_id: w.caseId })).toHaveLength(2);
  });

  it('changes the case ETag when a sign-off or a comment is added', async () => {
    const { w, canal } = await aCase({ submit: false });
    const before = await caseVersion(db.k, w.caseId);
    await addComment(db.k, ana, w.caseId, { id: randomUUID(), canalId: canal, text: 'A question' });
    const afterComment = await caseVersion(db.k, w.caseId);
    expect(afterComment).not.toBe(before);
    const cone = {
      id: randomUUID(),
      checkpoint: 'cone-fit',
      canalId: canal,
      decision: 'approve',
      expectedState: 'open',
    };
    await signOff(db.k, helen, w.caseId, cone as SignoffInput);
    expect(await caseVersion(db.k, w.caseId)).not.toBe(afterComment);
  });
});

describe('reopen', () => {
  it('returns an approved case to open, keeps every sign-off and marks the approval superseded', async () => {
    const { w, canal } = await aCase();
    await signOff(db.k, helen, w.caseId, final('approve'));
    expect((await reopen(db.k, ana, w.caseId, { id: randomUUID(), reason: 'x' })).status).toBe(403);
    const answer = await reopen(db.k, helen, w.caseId, {
      id: randomUUID(),
      reason: 'The post-op radiograph was missed',
    });
    expect(answer).toMatchObject({ status: 201, body: { reviewStatus: 'open', signoff: { decision: 'reopened' } } });
    const rows = await db.k('signoffs').where({ case_id: w.caseId }).orderBy('id');
    expect(rows.map((r) => r.decision)).toEqual(['approved', 'reopened']);
    expect(rows[0]!.superseded_by).toBe(rows[1]!.id);
    expect(await db.k('audit_log').where({ action: 'case.reopen', subject_id: w.caseId })).toHaveLength(1);
    const step = w.add('note.added', { text: 'Recorded after reopening' }, canal);
    expect((await ingestBatch(db.k, db.ana, 'tablet', [step])).results[0]!.status).toBe('stored');
  });

  it('refuses to reopen a case that is not signed off', async () => {
    const { w } = await aCase();
    expect(await reopen(db.k, helen, w.caseId, { id: randomUUID(), reason: 'Why not' })).toMatchObject({
      status: 409,
      body: { error: expect.stringMatching(/not signed off/) },
    });
  });
});

describe('addComment', () => {
  it('lets the student, an assigned attending and a director comment, and tells anyone else there is no such case', async () => {
    const { w, canal } = await aCase();
    for (const who of [ana, helen, ingrid])
      expect(
        (await addComment(db.k, who, w.caseId, { id: randomUUID(), canalId: canal, text: ' Fine. ' })).status,
      ).toBe(201);
    expect((await addComment(db.k, samuel, w.caseId, { id: randomUUID(), text: 'Hi' })).status).toBe(404);
    const texts = (await db.k('comments').where({ case_id: w.caseId })).map((c) => c.text);
    expect(texts).toEqual(['Fine.', 'Fine.', 'Fine.']);
  });

  it('refuses an event of another canal or case', async () => {
    const { w, canal } = await aCase();
    const other = await aCase();
    const answer = await addComment(db.k, helen, w.caseId, {
      id: randomUUID(),
      canalId: canal,
      eventId: other.submission!.id,
      text: 'Here',
    });
    expect(answer).toMatchObject({ status: 400, body: { field: 'eventId' } });
  });
});
