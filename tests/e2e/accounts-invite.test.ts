// Accounts in Chromium (docs/accounts.md): a director invites someone from /admin/invitations,
// the invitee opens the link from the e-mail caught by an in-process SMTP server, chooses a name
// and a password and signs in; a cohort is invited from pasted CSV rows; a student who forgot
// their password goes from the sign-in page through the e-mail back in. Axe on every new page.
import AxeBuilder from '@axe-core/playwright';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, signIn } from '../helpers/browser';
import { DEMO } from '../helpers/client';
import { freePort, startServer, type TestServer } from '../helpers/server';
import { testSmtp, type TestSmtp } from '../helpers/smtp';

const PUBLIC_URL = 'https://coneline.school.example';
let server: TestServer;
let smtp: TestSmtp;
let browser: Browser;

beforeAll(async () => {
  smtp = testSmtp(await freePort());
  await smtp.start();
  [server, browser] = await Promise.all([
    startServer({
      env: {
        SMTP_HOST: '127.0.0.1',
        SMTP_PORT: String(smtp.port),
        MAIL_FROM: 'Coneline <coneline@school.example>',
        PUBLIC_URL,
        MAIL_POLL_MS: '200',
      },
    }),
    launchBrowser(),
  ]);
});
afterAll(async () => {
  await browser?.close();
  await server?.stop();
  await smtp?.stop();
});

async function violations(page: Page): Promise<string[]> {
  const result = await new AxeBuilder({ page }).analyze();
  return result.violations.map((v) => `${v.impact}: ${v.id}: ${v.help} (${v.nodes.map((n) => n.target).join(', ')})`);
}

/**
 * The link of kind `path` in the newest e-mail to `to`, as a path on the test server: the
 * e-mail's link must start with PUBLIC_URL, which is not where the test server listens.
 */
async function linkFromMail(to: string, path: 'invite' | 'reset-password'): Promise<string> {
  const pattern = new RegExp(`${PUBLIC_URL.replace(/\./g, '\\.')}(/${path}/[A-Za-z0-9_-]{43})`);
  const deadline = Date.now() + 10_000;
  for (;;) {
    const mail = smtp.messages.filter((m) => m.to.includes(to) && pattern.test(m.raw.replace(/=\r?\n/g, ''))).at(-1);
    if (mail) return pattern.exec(mail.raw.replace(/=\r?\n/g, ''))![1]!;
    if (Date.now() > deadline) throw new Error(`no ${path} e-mail to ${to}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe('an invitation, from the director to the new account', () => {
  it('lets a director invite a student, who opens the link, chooses a name and password, and signs in', async () => {
    const email = 'wren.castell@school.example';
    const director = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await director.newPage();
    await signIn(page, server.baseUrl, DEMO.ingrid, DEMO.password);
    await page.getByRole('link', { name: 'Invitations' }).click();
    await page.getByRole('heading', { name: 'Invite one person' }).waitFor();
    expect(await violations(page)).toEqual([]);

    // A bad address is refused beside its field, before anything is sent.
    const form = page.getByRole('form', { name: 'Invite one person' });
    await form.getByLabel('E-mail').fill('wren at school');
    await page.getByRole('button', { name: 'Send the invitation' }).click();
    await expect(page.locator('#invite-email-error').textContent()).resolves.toMatch(/e-mail address/);
    expect(await violations(page)).toEqual([]);

    await form.getByLabel('E-mail').fill(email);
    await form.getByLabel('Name (optional)').fill('Wren Castell');
    await form.getByLabel('Role').selectOption('student');
    await form.getByLabel('Cohort').selectOption({ label: 'Larkfield class of 2028' });
    await form.getByRole('checkbox', { name: 'Dr Helen Vasquez' }).check();
    await page.getByRole('button', { name: 'Send the invitation' }).click();
    await page.getByText(`Invitation sent to ${email}.`).waitFor();
    await page.getByTestId('invitation-list').getByText(email).waitFor();
    await page.screenshot({ path: 'test-results/admin-invitations.png', fullPage: true });
    await director.close();

    const invitee = await browser.newContext({ viewport: { width: 768, height: 1024 } });
    const inv = await invitee.newPage();
    const path = await linkFromMail(email, 'invite');
    const res = await inv.goto(server.baseUrl + path);
    expect(res?.headers()['referrer-policy']).toBe('no-referrer');
    await inv.getByRole('heading', { name: 'Your invitation to Coneline' }).waitFor();
    await expect.poll(() => inv.getByLabel('Your name').inputValue()).toBe('Wren Castell');
    expect(await violations(inv)).toEqual([]);

    // Two different passwords are caught beside the second field.
    await inv.getByLabel('Password', { exact: true }).fill('obturation by the book');
    await inv.getByLabel('Password again').fill('obturation by the boot');
    await inv.getByRole('button', { name: 'Make my account' }).click();
    await expect(inv.locator('#field-confirm-error').textContent()).resolves.toMatch(/not the same/);
    await inv.getByLabel('Password again').fill('obturation by the book');
    await inv.screenshot({ path: 'test-results/invite-accept.png', fullPage: true });
    await Promise.all([
      inv.waitForURL((u) => u.pathname === '/signin'),
      inv.getByRole('button', { name: 'Make my account' }).click(),
    ]);
    await expect(inv.getByRole('status').first().textContent()).resolves.toContain('Your account is ready');
    expect(await violations(inv)).toEqual([]);

    await inv.getByLabel('E-mail').fill(email);
    await inv.getByLabel('Password').fill('obturation by the book');
    await Promise.all([
      inv.waitForURL((u) => u.pathname === '/'),
      inv.getByRole('button', { name: 'Sign in' }).click(),
    ]);
    await inv.getByRole('heading', { name: 'Your cases' }).waitFor();

    // The link is spent: opening it again says so, in an accessible page.
    await inv.goto(server.baseUrl + path);
    await inv.getByText('This invitation was already used').waitFor();
    expect(await violations(inv)).toEqual([]);
    await invitee.close();
  });

  it('invites a cohort from pasted CSV rows and shows each row’s result', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signIn(page, server.baseUrl, DEMO.ingrid, DEMO.password, '/admin/invitations');
    const rows = [
      'name,email',
      'Ivo Marsh,ivo.marsh@school.example',
      'Lena Sato,lena.sato@school.example',
      'Ivo Marsh,IVO.MARSH@school.example',
      'Pia Noor,pia.noor@school',
      `Tomas Lindqvist,${DEMO.tomas}`,
    ].join('\n');
    await page.getByLabel('Rows (from the file, or pasted)').fill(rows);
    await page.locator('#csv-cohort').selectOption({ label: 'Larkfield class of 2028' });
    await page.locator('#csv-attendings').getByRole('checkbox', { name: 'Dr Samuel Osei' }).check();
    await page.getByRole('button', { name: 'Invite every row' }).click();
    const results = page.getByTestId('csv-results');
    await results.waitFor();
    await expect(page.getByText('2 of 5 rows invited').count()).resolves.toBe(1);
    const statuses = await results
      .locator('tbody tr')
      .evaluateAll((trs) => trs.map((tr) => tr.getAttribute('data-status')));
    expect(statuses).toEqual(['invited', 'invited', 'duplicate', 'bad-email', 'has-account']);
    await expect(results.getByText('Already has an account').count()).resolves.toBe(1);
    expect(await violations(page)).toEqual([]);
    await page.screenshot({ path: 'test-results/admin-invitations-csv.png', fullPage: true });
    await context.close();
  });
});

describe('a forgotten password', () => {
  it('goes from the sign-in page through the e-mailed link back in', async () => {
    const context = await browser.newContext({ viewport: { width: 768, height: 1024 } });
    const page = await context.newPage();
    await page.goto(`${server.baseUrl}/signin`);
    await page.getByRole('link', { name: 'Forgot your password?' }).click();
    await page.getByRole('heading', { name: 'Forgot your password?' }).waitFor();
    expect(await violations(page)).toEqual([]);
    await page.getByLabel('E-mail').fill(DEMO.priya);
    await page.getByRole('button', { name: 'Send me a link' }).click();
    await page.getByText('If an active account uses that address').waitFor();
    expect(await violations(page)).toEqual([]);

    const path = await linkFromMail(DEMO.priya, 'reset-password');
    await page.goto(server.baseUrl + path);
    await page.getByRole('heading', { name: 'Set a new password' }).waitFor();
    expect(await violations(page)).toEqual([]);
    await page.getByLabel('New password', { exact: true }).fill('short');
    await page.getByRole('button', { name: 'Set my new password' }).click();
    await expect(page.locator('#field-password-error').textContent()).resolves.toMatch(/at least 12/);
    await page.getByLabel('New password', { exact: true }).fill('a clean apical seal');
    await page.getByLabel('New password again').fill('a clean apical seal');
    await page.screenshot({ path: 'test-results/reset-password.png', fullPage: true });
    await Promise.all([
      page.waitForURL((u) => u.pathname === '/signin'),
      page.getByRole('button', { name: 'Set my new password' }).click(),
    ]);
    await expect(page.getByRole('status').first().textContent()).resolves.toContain('Your new password is set');

    await page.getByLabel('E-mail').fill(DEMO.priya);
    await page.getByLabel('Password').fill('a clean apical seal');
    await Promise.all([
      page.waitForURL((u) => u.pathname === '/'),
      page.getByRole('button', { name: 'Sign in' }).click(),
    ]);
    await page.getByRole('heading', { name: 'Your cases' }).waitFor();

    // The link is spent.
    await page.goto(server.baseUrl + path);
    await page.getByText('This reset link was already used').waitFor();
    expect(await violations(page)).toEqual([]);
    await context.close();
  });
});
