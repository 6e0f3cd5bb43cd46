/**
 * The mail outbox: every e-mail is a row written in the transaction of its cause (a
 * submission, a sign-off), so a notice exists exactly when its cause does. A worker
 * (mail-worker.ts) sends the rows after commit: it claims a row before sending it, marks it
 * sent after, and on failure tries again later with a growing wait. The Message-ID comes from
 * the row's id, so a crash between sending and marking can at worst send the same message
 * again, under the same Message-ID. A recipient who takes a daily digest has their notices
 * held and sent as one e-mail a day (composeDigests).
 */
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import type { Clinic } from '../present/format';
import type { MailOutboxRow } from './tables';

/** One notice to one person, already written out (no patient details: see mail-notices.ts). */
export interface Notice {
  recipientId: number;
  caseId: string | null;
  kind: string;
  subject: string;
  text: string;
}

/** An e-mail as the transport gets it. */
export interface OutgoingMail {
  messageId: string;
  to: string;
  subject: string;
  text: string;
}

/** Sends one e-mail; rejects when the mail server did not take it. */
export type SendMail = (mail: OutgoingMail) => Promise<void>;

/** How long a claim holds: a worker that died mid-send frees its rows after this. */
export const CLAIM_MS = 5 * 60_000;
/** The longest wait between two tries of one e-mail. */
export const MAX_RETRY_MS = 60 * 60_000;
/** The clinic-local hour from which the day's digests go out. */
export const DIGEST_HOUR = 7;

/**
 * Writes a notice to the outbox inside the caller's transaction: `pending` to go at once, or
 * `held` for the daily digest when the recipient chose one. An inactive account gets nothing.
 */
export async function enqueueMail(trx: Knex, n: Notice, now: string): Promise<string | null> {
  const user = await trx('users').where({ id: n.recipientId }).first('email', 'active', 'mail_digest');
  if (!user || !user.active) return null;
  const id = randomUUID();
  await trx('mail_outbox').insert({
    id,
    recipient_id: n.recipientId,
    to_address: user.email,
    case_id: n.caseId,
    kind: n.kind,
    subject: n.subject,
    body_text: n.text,
    status: user.mail_digest ? 'held' : 'pending',
    attempts: 0,
    next_attempt_at: now,
    created_at: now,
  });
  return id;
}

/** An e-mail that is not a review notice: an invitation or a password-reset link. */
export interface DirectMail {
  /** The account it goes to; null for an address with no account yet (an invitation). */
  recipientId: number | null;
  to: string;
  kind: 'invitation' | 'password-reset';
  subject: string;
  text: string;
}

/**
 * Kinds whose text holds a link's secret token. Once such an e-mail is sent, the token is
 * blanked out of the stored copy (`scrubLinks`): the database keeps tokens only as hashes.
 */
export const SECRET_LINK_KINDS: ReadonlySet<string> = new Set(['invitation', 'password-reset']);

/** The text with every invitation or reset link's token replaced by a mark. */
export function scrubLinks(text: string): string {
  return text.replace(/\/(invite|reset-password)\/[A-Za-z0-9_-]{20,}/g, '/$1/[link removed once sent]');
}

/**
 * Writes an e-mail to go at once (never held for a digest: a link that lasts an hour cannot
 * wait for tomorrow's digest), inside the caller's transaction. Answers the outbox row's id.
 */
export async function enqueueDirectMail(trx: Knex, m: DirectMail, now: string): Promise<string> {
  const id = randomUUID();
  await trx('mail_outbox').insert({
    id,
    recipient_id: m.recipientId,
    to_address: m.to,
    case_id: null,
    kind: m.kind,
    subject: m.subject,
    body_text: m.text,
    status: 'pending',
    attempts: 0,
    next_attempt_at: now,
    created_at: now,
  });
  return id;
}

/** The Message-ID of an outbox row: the same row always makes the same Message-ID. */
export function messageIdOf(outboxId: string, publicUrl: string): string {
  let host = 'coneline.localhost';
  try {
    host = new URL(publicUrl).hostname || host;
  } catch {
    // an unreadable PUBLIC_URL keeps the fallback host; the id part still makes it unique
  }
  return `<${outboxId}@${host}>`;
}

/** The wait before the next try after `attempts` failed ones: doubling from `retryMs`, capped. */
export function backoffMs(attempts: number, retryMs: number): number {
  return Math.min(retryMs * 2 ** Math.max(0, attempts - 1), MAX_RETRY_MS);
}

const iso = (t: number) => new Date(t).toISOString();

/** Claims up to `limit` rows due now for one worker, in one transaction (SQLite serialises it). */
async function claim(k: Knex, now: number, limit: number): Promise<MailOutboxRow[]> {
  const token = randomUUID();
  const at = iso(now);
  await k.transaction(async (trx) => {
    const due = (await trx('mail_outbox')
      .select('id')
      .where({ status: 'pending' })
      .where('next_attempt_at', '<=', at)
      .where((q) => q.whereNull('claimed_until').orWhere('claimed_until', '<', at))
      .orderBy('created_at')
      .limit(limit)) as { id: string }[];
    if (due.length === 0) return;
    await trx('mail_outbox')
      .whereIn(
        'id',
        due.map((d) => d.id),
      )
      .update({ claimed_until: iso(now + CLAIM_MS), claim_token: token });
  });
  return (await k('mail_outbox').where({ claim_token: token, status: 'pending' })) as MailOutboxRow[];
}

export interface DeliveryRun {
  sent: number;
  failed: number;
}

/**
 * Sends the e-mails due at `now`: claims them, sends each, marks it sent, or on failure
 * counts the try and sets when to try again. Never throws for a mail server's fault.
 */
export async function deliverDue(
  k: Knex,
  send: SendMail,
  opts: { now?: Date; retryMs: number; publicUrl: string; limit?: number },
): Promise<DeliveryRun> {
  const now = (opts.now ?? new Date()).getTime();
  const rows = await claim(k, now, opts.limit ?? 20);
  const run: DeliveryRun = { sent: 0, failed: 0 };
  for (const row of rows) {
    const mine = () => k('mail_outbox').where({ id: row.id, claim_token: row.claim_token });
    try {
      await send({
        messageId: messageIdOf(row.id, opts.publicUrl),
        to: row.to_address,
        subject: row.subject,
        text: row.body_text,
      });
      await mine().update({
        status: 'sent',
        sent_at: iso(Date.now()),
        claimed_until: null,
        last_error: null,
        ...(SECRET_LINK_KINDS.has(row.kind) ? { body_text: scrubLinks(row.body_text) } : {}),
      });
      run.sent += 1;
    } catch (err) {
      const attempts = row.attempts + 1;
      await mine().update({
        attempts,
        next_attempt_at: iso(now + backoffMs(attempts, opts.retryMs)),
        claimed_until: null,
        last_error: String((err as Error)?.message ?? err).slice(0, 500),
      });
      run.failed += 1;
    }
  }
  return run;
}

/** The clinic-local day (YYYY-MM-DD), hour, minute and second of an instant. */
export function clinicDayAndHour(
  now: Date,
  clinic: Clinic,
): { day: string; hour: number; minute: number; second: number } {
  const parts = Object.fromEntries(
    new Intl.DateTimeFormat('en-CA', {
      timeZone: clinic.timeZone,
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
      hourCycle: 'h23',
    })
      .formatToParts(now)
      .map((p) => [p.type, p.value]),
  );
  return {
    day: `${parts.year}-${parts.month}-${parts.day}`,
    hour: Number(parts.hour),
    minute: Number(parts.minute),
    second: Number(parts.second),
  };
}

/**
 * Once a day, from DIGEST_HOUR clinic time: gathers each recipient's notices held before that
 * hour into one digest e-mail (a new pending row) and marks them `digested`, in one
 * transaction. A recipient gets at most one digest a day (its `digest_key`); notices held
 * after the hour wait for the next day's. Answers how many digests it wrote.
 */
export async function composeDigests(k: Knex, now: Date, clinic: Clinic): Promise<number> {
  const { day, hour, minute, second } = clinicDayAndHour(now, clinic);
  if (hour < DIGEST_HOUR) return 0;
  // Today's DIGEST_HOUR as an instant (off by the shift on a day the clocks change, at worst).
  const since = ((hour - DIGEST_HOUR) * 3600 + minute * 60 + second) * 1000 + now.getUTCMilliseconds();
  const cutoff = new Date(now.getTime() - since).toISOString();
  return k.transaction(async (trx) => {
    const recipients = (await trx('mail_outbox')
      .distinct('recipient_id')
      .where({ status: 'held' })
      .where('created_at', '<', cutoff)) as {
      recipient_id: number;
    }[];
    let written = 0;
    for (const { recipient_id } of recipients) {
      const key = `${recipient_id}:${day}`;
      if (await trx('mail_outbox').where({ digest_key: key }).first('id')) continue;
      const held = (await trx('mail_outbox')
        .where({ recipient_id, status: 'held' })
        .where('created_at', '<', cutoff)
        .orderBy('created_at')) as MailOutboxRow[];
      const id = randomUUID();
      const count = held.length;
      await trx('mail_outbox').insert({
        id,
        recipient_id,
        to_address: held.at(-1)!.to_address,
        case_id: null,
        kind: 'digest',
        subject: `Coneline: ${count} review notice${count === 1 ? '' : 's'} since the last digest`,
        body_text: [
          `Your daily Coneline digest: ${count} notice${count === 1 ? '' : 's'}.`,
          ...held.map((h) => `— ${h.subject}\n${h.body_text}`),
        ].join('\n\n'),
        status: 'pending',
        attempts: 0,
        next_attempt_at: now.toISOString(),
        digest_key: key,
        created_at: now.toISOString(),
      });
      await trx('mail_outbox')
        .whereIn(
          'id',
          held.map((h) => h.id),
        )
        .update({ status: 'digested', digest_id: id });
      written += 1;
    }
    return written;
  });
}
