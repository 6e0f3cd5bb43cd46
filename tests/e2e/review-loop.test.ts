// The whole teaching loop in Chromium, with real e-mail through the local stand-in (maildev,
// as `npm start` runs it): a student submits from the tablet, the attending finds the case in
// the queue on a phone-sized screen and returns it with a comment, the student reads the
// comment on the tablet, puts it right and submits again, and the attending approves. Each
// step's e-mail reaches the stand-in's mailbox, with the tooth and a link, never a chart number.
// Invented scenario: Mira Okafor's extracted lower left first molar (36), distal canal.
import { randomUUID } from 'node:crypto';
import { mkdirSync } from 'node:fs';
import { resolve } from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMailbox, type Mailbox } from '../../scripts/lib/mailbox';
import { launchBrowser, signIn } from '../helpers/browser';
import { Driver, openChairside, recordCanal, setUpDistal36, tapScreen } from '../helpers/chairside';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';
import { mailEnv } from '../helpers/smtp';

const PUBLIC_URL = 'https://coneline.larkfield.example';
let mailbox: Mailbox;
let server: TestServer;
let browser: Browser;
let helenApi: ApiClient;

beforeAll(async () => {
  mkdirSync('test-results', { recursive: true });
  mailbox = await startMailbox(resolve(import.meta.dirname, '../..'));
  [server, browser] = await Promise.all([
    startServer({
      env: {
        ...mailEnv(mailbox.smtpPort, PUBLIC_URL),
      },
    }),
    launchBrowser(),
  ]);
  helenApi = await apiSignIn(server.baseUrl, DEMO.helen, DEMO.password);
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await server?.stop();
  mailbox?.proc.kill();
});

interface Mail {
  subject: string;
  to: { address: string }[];
  text?: string;
  html?: string;
}

/** Every message the stand-in holds, read through its web mailbox's REST API (/api/email). */
async function mails(): Promise<Mail[]> {
  return (await (await fetch(`${mailbox.webUrl}/api/email`)).json()) as Mail[];
}

/** Waits for the `n`th message to `to` about tooth 36 whose subject matches. */
async function mailTo(to: string, subject: RegExp, n = 1): Promise<Mail> {
  const deadline = Date.now() + 30_000;
  for (;;) {
    const found = (await mails()).filter(
      (m) => m.to.some((t) => t.address === to) && /\b36\b/.test(m.subject) && subject.test(m.subject),
    );
    if (found.length >= n) return found[n - 1]!;
    if (Date.now() > deadline) {
      throw new Error(`no mail ${subject} to ${to}; have ${(await mails()).map((m) => m.subject).join(' | ')}`);
    }
    await new Promise((r) => setTimeout(r, 250));
  }
}

/** The state of Mira's newest tooth-36 case as the attending's queue reports it. */
async function queued(state: string): Promise<{ caseId: string }> {
  const deadline = Date.now() + 30_000;
  for (;;) {
    const res = await helenApi.fetch(`/api/review/queue?state=${state}`);
    const body = (await res.json()) as { rows: { caseId: string; tooth: number | null; student: { name: string } }[] };
    const row = body.rows.find((r) => r.tooth === 36 && r.student.name === 'Mira Okafor');
    if (row) return row;
    if (Date.now() > deadline) throw new Error(`Mira's tooth 36 never showed as ${state}`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

async function syncNow(page: Page): Promise<void> {
  await tapScreen(page, page.getByRole('button', { name: 'Sync now' }));
}

/** A mail links to the school's Coneline and never carries a chart number. */
function checkMail(m: Mail): void {
  const body = `${m.subject}\n${m.text ?? ''}\n${m.html ?? ''}`;
  expect(body).toContain(PUBLIC_URL);
  expect(body).not.toMatch(/LK-\d+/);
}

describe('the review loop', () => {
  it('runs from submission through a return and a second submission to approval, with its e-mails', async () => {
    // The student, at the chair: one canal filled, the access restored, no post-op radiograph yet.
    const tabletContext = await browser.newContext({ viewport: { width: 1024, height: 768 } });
    const tablet = await tabletContext.newPage();
    await openChairside(tablet, server.baseUrl, DEMO.mira);
    await setUpDistal36(tablet);
    await recordCanal(new Driver(tablet), { shortCone: false });
    await tapScreen(tablet, tablet.getByRole('button', { name: 'Finish tooth' }));
    await tapScreen(tablet, tablet.getByRole('button', { name: 'Restored', exact: true }));
    // Saved first: the finishing screen changes once it is, and ignores taps for a moment then.
    await tablet.getByText('✓ Access restored').waitFor();
    await tapScreen(tablet, tablet.getByRole('button', { name: 'Submit for review' }));
    await syncNow(tablet);
    await tablet.screenshot({ path: 'test-results/review-loop-tablet-submitted.png' });
    const { caseId } = await queued('needs-action');
    checkMail(await mailTo(DEMO.helen, /submitted|review/i));

    // The attending, on the clinic floor with a phone: the queue, the case, a return.
    const phoneContext = await browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true });
    const phone = await phoneContext.newPage();
    await signIn(phone, server.baseUrl, DEMO.helen, DEMO.password, '/review');
    if (new URL(phone.url()).pathname !== '/review') await phone.goto(`${server.baseUrl}/review`);
    const item = phone
      .getByLabel('Cases in the review queue')
      .getByRole('listitem')
      .filter({ hasText: 'Mira Okafor' })
      .filter({ hasText: 'Tooth 36' });
    await item.first().waitFor();
    await phone.screenshot({ path: 'test-results/review-loop-queue-390.png' });
    await Promise.all([phone.waitForURL(`**/cases/${caseId}**`), item.first().getByRole('link').first().click()]);
    const form = phone.getByTestId('signoff-form');
    await form.getByLabel('The whole case (final)').check();
    await form.getByLabel('Return to the student').check();
    const why = 'Take the post-operative radiograph and record it, then submit again.';
    await form.getByLabel(/^Comment/).fill(why);
    await Promise.all([
      phone.waitForEvent('load'),
      form.getByRole('button', { name: 'Return to the student' }).click(),
    ]);
    await expect(phone.getByTestId('case-state').textContent()).resolves.toBe('Returned');
    checkMail(await mailTo(DEMO.mira, /back|return/i));

    // The student reads it on the tablet (the next pull brings it), puts it right, submits again.
    await tablet.reload();
    const cases = tablet.getByRole('button', { name: 'Cases' });
    await tapScreen(tablet, cases);
    const row = tablet
      .getByRole('listitem')
      .filter({ has: tablet.getByRole('button', { name: 'Tooth 36', exact: true }) })
      .filter({ has: tablet.getByTestId('came-back') });
    await row.first().getByTestId('return-comment').waitFor();
    await expect(row.first().getByTestId('return-comment').textContent()).resolves.toContain(why);
    await tapScreen(tablet, row.first().getByRole('button', { name: 'Tooth 36', exact: true }));
    await expect(tablet.getByTestId('case-news').textContent()).resolves.toContain(why);
    await tablet.screenshot({ path: 'test-results/review-loop-tablet-came-back.png' });
    await tapScreen(tablet, tablet.getByRole('button', { name: 'Finish tooth' }));
    await tapScreen(tablet, tablet.getByRole('button', { name: 'Taken', exact: true }));
    await tablet.getByText('✓ Post-operative radiograph taken').waitFor();
    await tapScreen(tablet, tablet.getByRole('button', { name: 'Submit for review' }));
    await syncNow(tablet);
    await queued('needs-action');
    checkMail(await mailTo(DEMO.helen, /submitted|review/i, 2));

    // The attending approves; the case is locked and the student is told.
    await phone.reload();
    await phone.getByTestId('case-state').waitFor();
    await expect(phone.getByTestId('case-state').textContent()).resolves.toBe('Waiting for review');
    await form.getByLabel('The whole case (final)').check();
    await form.getByLabel('Approve').check();
    await Promise.all([phone.waitForEvent('load'), form.getByRole('button', { name: 'Approve' }).click()]);
    await expect(phone.getByTestId('case-state').textContent()).resolves.toMatch(/Approved|Signed off/);
    await phone.screenshot({ path: 'test-results/review-loop-approved-390.png', fullPage: true });
    checkMail(await mailTo(DEMO.mira, /approved|signed off/i));

    // A step recorded now is refused: the approval locks the case until it is reopened.
    const late = await helenApi.fetch(`/api/cases/${caseId}`);
    expect(((await late.json()) as { reviewStatus: string }).reviewStatus).toBe('approved');
    const again = await helenApi.post(`/api/cases/${caseId}/signoffs`, {
      id: randomUUID(),
      checkpoint: 'final',
      decision: 'approve',
      expectedState: 'submitted',
    });
    expect(again.status).toBe(409);
    await tabletContext.close();
    await phoneContext.close();
  });
});
