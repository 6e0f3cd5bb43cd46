// The mail outbox (docs/review.md, "E-mail"): sent after commit over real SMTP to an in-process
// server, tried again while the server is down, each e-mail once, Message-ID from the outbox
// id, and the daily digest.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { freePort } from '../../../scripts/lib/server-process';
import {
  backoffMs,
  CLAIM_MS,
  clinicDayAndHour,
  composeDigests,
  deliverDue,
  enqueueMail,
  messageIdOf,
} from '../../../src/lib/server/mail-outbox';
import { composeNotice } from '../../../src/lib/server/mail-notices';
import { smtpSender } from '../../../src/lib/server/mail-worker';
import { syncDb, type SyncDb } from '../../helpers/sync-db';
import { testSmtp, type TestSmtp } from '../../helpers/smtp';

const PUBLIC_URL = 'https://coneline.school.example';
const LONDON = { timeZone: 'Europe/London', locale: 'en-GB' };
let db: SyncDb;
let smtp: TestSmtp;
let send: ReturnType<typeof smtpSender>;

beforeAll(async () => {
  db = await syncDb();
  smtp = testSmtp(await freePort());
  send = smtpSender({
    host: '127.0.0.1',
    port: smtp.port,
    secure: false,
    user: undefined,
    pass: undefined,
    from: 'Coneline <coneline@school.example>',
  });
});
afterAll(async () => {
  await smtp.stop();
  await db.close();
});
beforeEach(async () => {
  await db.k('mail_outbox').del();
  smtp.messages.length = 0;
});

const notice = (subject: string) => ({ recipientId: db.ana, caseId: null, kind: 'test', subject, text: 'Body' });
const at = (iso: string) => new Date(iso);
const run = (now: string) => deliverDue(db.k, send, { now: at(now), retryMs: 30_000, publicUrl: PUBLIC_URL });

describe('deliverDue', () => {
  it('keeps an e-mail while the mail server is down and delivers it once when it is up', async () => {
    const id = await db.k.transaction((trx) => enqueueMail(trx, notice('Returned to you'), '2026-12-07T10:00:00.000Z'));
    expect(await run('2026-12-07T10:00:01.000Z')).toEqual({ sent: 0, failed: 1 });
    const row = await db.k('mail_outbox').where({ id: id! }).first();
    expect(row).toMatchObject({ status: 'pending', attempts: 1, next_attempt_at: '2026-12-07T10:00:31.000Z' });
    expect(row!.last_error).toBeTruthy();

    await smtp.start();
    try {
      expect(await run('2026-12-07T10:00:20.000Z')).toEqual({ sent: 0, failed: 0 }); // not due yet
      expect(await run('2026-12-07T10:00:40.000Z')).toEqual({ sent: 1, failed: 0 });
      expect(await run('2026-12-07T11:00:00.000Z')).toEqual({ sent: 0, failed: 0 });
      expect(smtp.messages).toHaveLength(1);
      expect(smtp.messages[0]).toMatchObject({
        to: ['ana@test.example'],
        subject: 'Returned to you',
        messageId: messageIdOf(id!, PUBLIC_URL),
      });
      expect((await db.k('mail_outbox').where({ id: id! }).first())!.status).toBe('sent');
    } finally {
      await smtp.stop();
    }
  });

  it('sends a row again under the same Message-ID when a worker died after claiming it', async () => {
    const id = await db.k.transaction((trx) => enqueueMail(trx, notice('Signed off'), '2026-12-07T10:00:00.000Z'));
    // A worker claimed it and died before marking it.
    await db
      .k('mail_outbox')
      .where({ id: id! })
      .update({ claimed_until: new Date(Date.parse('2026-12-07T10:00:00.000Z') + CLAIM_MS).toISOString() });
    await smtp.start();
    try {
      expect(await run('2026-12-07T10:01:00.000Z')).toEqual({ sent: 0, failed: 0 }); // still claimed
      expect(await run('2026-12-07T10:06:00.000Z')).toEqual({ sent: 1, failed: 0 });
      expect(smtp.messages.map((m) => m.messageId)).toEqual([`<${id}@coneline.school.example>`]);
    } finally {
      await smtp.stop();
    }
  });

  it('waits twice as long after each failure, at most an hour', () => {
    expect([1, 2, 3].map((n) => backoffMs(n, 30_000))).toEqual([30_000, 60_000, 120_000]);
    expect(backoffMs(20, 30_000)).toBe(3_600_000);
  });
});

describe('composeDigests', () => {
  it('holds the notices of a digest reader and sends them as one e-mail a day from 07:00 clinic time', async () => {
    await db.k('users').where({ id: db.ben }).update({ mail_digest: true });
    try {
      const ben = (subject: string) => ({ ...notice(subject), recipientId: db.ben });
      await db.k.transaction(async (trx) => {
        await enqueueMail(trx, ben('Waiting for your review: tooth 36'), '2026-12-07T15:00:00.000Z');
        await enqueueMail(trx, ben('Waiting for your review: tooth 11'), '2026-12-07T16:00:00.000Z');
      });
      expect(await run('2026-12-07T17:00:00.000Z')).toEqual({ sent: 0, failed: 0 });
      expect(await composeDigests(db.k, at('2026-12-08T06:30:00.000Z'), LONDON)).toBe(0);
      expect(await composeDigests(db.k, at('2026-12-08T07:05:00.000Z'), LONDON)).toBe(1);
      expect(await composeDigests(db.k, at('2026-12-08T09:00:00.000Z'), LONDON)).toBe(0);
      await smtp.start();
      try {
        expect(await run('2026-12-08T07:06:00.000Z')).toEqual({ sent: 1, failed: 0 });
      } finally {
        await smtp.stop();
      }
      expect(smtp.messages).toHaveLength(1);
      expect(smtp.messages[0]!.subject).toMatch(/2 review notices/);
      expect(smtp.messages[0]!.raw).toContain('tooth 36');
      expect(smtp.messages[0]!.raw).toContain('tooth 11');
      expect((await db.k('mail_outbox').where({ recipient_id: db.ben, status: 'digested' })).length).toBe(2);

      // Held after the hour: it waits for the next day's digest.
      await db.k.transaction((trx) =>
        enqueueMail(trx, ben('Waiting for your review: tooth 21'), '2026-12-08T08:00:00.000Z'),
      );
      expect(await composeDigests(db.k, at('2026-12-08T20:00:00.000Z'), LONDON)).toBe(0);
      expect(await composeDigests(db.k, at('2026-12-09T07:00:30.000Z'), LONDON)).toBe(1);
      const next = await db
        .k('mail_outbox')
        .where({ kind: 'digest', recipient_id: db.ben })
        .orderBy('created_at', 'desc')
        .first();
      expect(next!.body_text).toContain('tooth 21');
      expect(next!.body_text).not.toContain('tooth 36');
    } finally {
      await db.k('users').where({ id: db.ben }).update({ mail_digest: false });
    }
  });

  it('reads the day and hour in the clinic zone', () => {
    expect(clinicDayAndHour(at('2026-12-07T23:30:00Z'), { timeZone: 'Pacific/Auckland', locale: 'en-NZ' })).toEqual({
      day: '2026-12-08',
      hour: 12,
      minute: 30,
      second: 0,
    });
  });
});

describe('composeNotice', () => {
  const c = {
    id: 'c0ffee00-0000-4000-8000-000000000001',
    setting: 'patient' as const,
    tooth: 46,
    openedAt: '2026-12-03T09:00:00Z',
    studentName: 'Ana Student',
  };

  it('names the tooth, the date and the link, and nothing of the patient', () => {
    const n = composeNotice('submitted', c, { clinic: LONDON, publicUrl: PUBLIC_URL });
    expect(n.subject).toBe('Waiting for your review: tooth 46 (patient), 3 Dec 2026');
    expect(n.text).toContain(`${PUBLIC_URL}/cases/${c.id}`);
    expect(n.text).toContain('Ana Student');
  });

  it('says which checkpoint came back on a return, without the comment', () => {
    const n = composeNotice('returned', c, {
      clinic: LONDON,
      publicUrl: PUBLIC_URL,
      checkpoint: 'fill-check',
      canalName: 'MB',
    });
    expect(n.text).toMatch(/returned the fill check of canal MB/);
  });

  it('asks the attending to check a cone fit from the review queue, naming the canal and not the case page', () => {
    const n = composeNotice('conefit', c, { clinic: LONDON, publicUrl: PUBLIC_URL, canalName: 'D' });
    expect(n.subject).toBe('Cone fit to check: tooth 46 (patient), 3 Dec 2026');
    expect(n.text).toContain('Ana Student asks you to check the cone fit of canal D');
    expect(n.text).toContain(`${PUBLIC_URL}/review`);
    expect(n.text).not.toContain(`/cases/${c.id}`);
  });
});
