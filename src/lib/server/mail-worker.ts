/**
 * The server's mail worker: every MAIL_POLL_MS, and soon after a service commits a notice
 * (kickMail), it writes the day's digests when due and sends what the outbox holds, over SMTP
 * with nodemailer. A mail server that is down only delays e-mail: the rows wait and are tried
 * again (mail-outbox.ts); nothing that caused them is affected.
 */
import type { Knex } from 'knex';
import nodemailer from 'nodemailer';
import { config, type SmtpConfig } from './config';
import { composeDigests, deliverDue, type SendMail } from './mail-outbox';

/** A sender over SMTP with the given settings. */
export function smtpSender(smtp: SmtpConfig): SendMail {
  const transport = nodemailer.createTransport({
    host: smtp.host,
    port: smtp.port,
    secure: smtp.secure,
    ...(smtp.user ? { auth: { user: smtp.user, pass: smtp.pass ?? '' } } : {}),
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 30_000,
  });
  return async (mail) => {
    await transport.sendMail({
      from: smtp.from,
      to: mail.to,
      subject: mail.subject,
      text: mail.text,
      messageId: mail.messageId,
    });
  };
}

interface Worker {
  k: Knex;
  send: SendMail;
  timer: NodeJS.Timeout | null;
  running: Promise<void> | null;
  again: boolean;
  stopped: boolean;
}

let worker: Worker | null = null;

/** One pass: digests when due, then everything due. Errors are logged, never thrown. */
async function pass(w: Worker): Promise<void> {
  const { clinic, mail, publicUrl } = config();
  try {
    const now = new Date();
    await composeDigests(w.k, now, clinic);
    // Keep going while a full batch went out: a backlog drains without waiting a poll.
    for (;;) {
      const run = await deliverDue(w.k, w.send, { now, retryMs: mail.retryMs, publicUrl });
      if (run.sent + run.failed < 20 || run.failed > 0 || w.stopped) break;
    }
  } catch (err) {
    console.error('mail outbox:', (err as Error).message);
  }
}

function schedule(w: Worker, ms: number): void {
  if (w.stopped) return;
  if (w.timer) clearTimeout(w.timer);
  w.timer = setTimeout(() => void tick(w), ms);
  w.timer.unref();
}

async function tick(w: Worker): Promise<void> {
  w.timer = null;
  if (w.running) {
    w.again = true;
    return;
  }
  w.running = pass(w);
  await w.running;
  w.running = null;
  if (w.again) {
    w.again = false;
    schedule(w, 0);
  } else schedule(w, config().mail.pollMs);
}

/** Starts the worker on `k` (once); `send` defaults to SMTP with the configured settings. */
export function startMailWorker(k: Knex, send: SendMail = smtpSender(config().smtp)): void {
  if (worker) return;
  worker = { k, send, timer: null, running: null, again: false, stopped: false };
  schedule(worker, 0);
}

/** Asks the worker to look at the outbox soon (after a service committed a notice); no-op when not started. */
export function kickMail(): void {
  if (worker && !worker.stopped) schedule(worker, 50);
}

/** Stops the worker and waits for a pass in progress. */
export async function stopMailWorker(): Promise<void> {
  const w = worker;
  worker = null;
  if (!w) return;
  w.stopped = true;
  if (w.timer) clearTimeout(w.timer);
  await w.running;
}
