// The director sets up a cohort in Chromium without the command line: creates a cohort, moves
// a student into it, gives a student a second attending, deactivates an attending (whose
// students are listed right there for another attending, and whose open session ends), and
// filters the case list. Every new page and the account dialog pass axe, at 1280 × 800 and at
// 390 px wide; the screenshots are kept in test-results/.
import AxeBuilder from '@axe-core/playwright';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, signIn } from '../helpers/browser';
import { DEMO } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let browser: Browser;
let context: BrowserContext;
let page: Page;

const WIDE = { width: 1280, height: 800 };
const NARROW = { width: 390, height: 844 };
const COHORT = 'Larkfield class of 2029';

beforeAll(async () => {
  [server, browser] = await Promise.all([startServer(), launchBrowser()]);
  context = await browser.newContext({ viewport: WIDE });
  page = await context.newPage();
  await signIn(page, server.baseUrl, DEMO.ingrid, DEMO.password);
});
afterAll(async () => {
  await context?.close();
  await browser?.close();
  await server?.stop();
});

/** Every axe violation, whatever its impact. */
async function violations(p: Page, include?: string): Promise<string[]> {
  const builder = new AxeBuilder({ page: p });
  if (include) builder.include(include);
  const result = await builder.analyze();
  return result.violations.map((v) => `${v.id} (${v.impact}): ${v.help} — ${v.nodes.map((n) => n.target).join(' ')}`);
}

/** Axe and a screenshot at both widths, back at 1280 × 800 after. */
async function checkAndShoot(p: Page, name: string): Promise<void> {
  for (const [size, label] of [
    [WIDE, 'wide'],
    [NARROW, 'narrow'],
  ] as const) {
    await p.setViewportSize(size);
    expect(await violations(p), `${name} ${label}`).toEqual([]);
    // Nothing wider than the screen: only a table scrolls, inside its own box.
    expect(await p.evaluate(() => document.documentElement.scrollWidth), `${name} ${label}`).toBeLessThanOrEqual(
      size.width,
    );
    await p.screenshot({ path: `test-results/admin-${name}-${label}.png`, fullPage: true });
  }
  await p.setViewportSize(WIDE);
}

/** Hydrated: the island answers clicks only once React has taken the server's HTML over. */
async function hydrated(p: Page): Promise<void> {
  await p.waitForFunction(() => !document.querySelector('astro-island[ssr]'));
}

describe('a director setting up a cohort in Chromium', () => {
  it('creates a cohort, with the form’s errors beside its fields', async () => {
    await page.goto(`${server.baseUrl}/admin/cohorts`);
    await hydrated(page);
    await checkAndShoot(page, 'cohorts');

    const create = page.getByRole('button', { name: 'Create cohort' });
    await create.click();
    // Checked in the page by the contract's own schema, before anything is sent.
    await expect(page.locator('#new-cohort-name-error').textContent()).resolves.toBe('Give the cohort a name.');
    await expect(page.locator('#new-cohort-name').getAttribute('aria-invalid')).resolves.toBe('true');
    // A name another cohort has: the server's 409, put beside the name.
    await page.locator('#new-cohort-name').fill('larkfield class of 2028');
    await create.click();
    await expect(page.locator('#new-cohort-name-error').textContent()).resolves.toContain('already a cohort called');

    await page.locator('#new-cohort-name').fill(COHORT);
    await page.locator('#new-cohort-year').fill('2029');
    await create.click();
    await page.getByText(`Created “${COHORT}”.`).waitFor();
    await page.getByTestId('cohort').filter({ hasText: COHORT }).getByText('Class of 2029 · 0 students').waitFor();
  });

  it('moves a seeded student into it and gives another student a second attending', async () => {
    const priya = page.locator('li', { has: page.getByText('priya.raman@larkfield.example') });
    await priya.getByLabel('Cohort of Priya Raman').selectOption({ label: COHORT });
    await priya.getByRole('button', { name: 'Move' }).click();
    await priya.getByText(`Priya Raman is now in ${COHORT}.`).waitFor();
    await page.getByTestId('cohort').filter({ hasText: COHORT }).getByText('Class of 2029 · 1 student').waitFor();

    const mira = page.locator('li', { has: page.getByText('mira.okafor@larkfield.example') });
    await mira.getByRole('checkbox', { name: 'Dr Samuel Osei' }).check();
    await mira.getByRole('button', { name: 'Save attendings' }).click();
    await mira.getByText('Saved: Mira Okafor is reviewed by Dr Helen Vasquez, Dr Samuel Osei.').waitFor();
    expect(await violations(page)).toEqual([]);
    await page.screenshot({ path: 'test-results/admin-cohorts-after.png', fullPage: true });
  });

  it('deactivates an attending, ending their session, and reassigns their students right there', async () => {
    // Samuel is signed in elsewhere.
    const elsewhere = await browser.newContext();
    const samuelPage = await elsewhere.newPage();
    await signIn(samuelPage, server.baseUrl, DEMO.samuel, DEMO.password);
    expect(new URL(samuelPage.url()).pathname).toBe('/');

    await page.goto(`${server.baseUrl}/admin/accounts`);
    await hydrated(page);
    await checkAndShoot(page, 'accounts');
    await page.getByRole('button', { name: 'Manage Dr Samuel Osei' }).click();
    const dialog = page.getByRole('dialog', { name: 'Dr Samuel Osei' });
    await dialog.waitFor();
    expect(await violations(page, 'dialog')).toEqual([]);
    await dialog.getByRole('button', { name: 'Deactivate…' }).click();
    await dialog.getByRole('button', { name: 'Deactivate Dr Samuel Osei' }).click();
    await dialog.getByText(/Dr Samuel Osei is deactivated; 1 session ended\./).waitFor();

    const section = dialog.getByRole('region', { name: 'Students to give another attending' });
    await section.waitFor();
    const rows = section.getByTestId('reassign');
    await expect(rows.allTextContents()).resolves.toEqual([
      expect.stringContaining('Mira Okafor: also reviewed by Dr Helen Vasquez.'),
      expect.stringContaining('Priya Raman: ■ no other active attending.'),
      expect.stringContaining('Tomas Lindqvist: also reviewed by Dr Helen Vasquez.'),
    ]);
    const priya = rows.filter({ hasText: 'Priya Raman' });
    await priya.getByRole('checkbox', { name: 'Dr Helen Vasquez' }).check();
    await priya.getByRole('button', { name: 'Save attendings' }).click();
    await priya
      .getByText('Saved: Priya Raman is reviewed by Dr Helen Vasquez, Dr Samuel Osei (deactivated).')
      .waitFor();
    await priya.getByText('Priya Raman: also reviewed by Dr Helen Vasquez.').waitFor();
    for (const [size, label] of [
      [WIDE, 'wide'],
      [NARROW, 'narrow'],
    ] as const) {
      await page.setViewportSize(size);
      expect(await violations(page, 'dialog'), label).toEqual([]);
      await page.screenshot({ path: `test-results/admin-deactivated-${label}.png` });
    }
    await page.setViewportSize(WIDE);
    await dialog.getByRole('button', { name: 'Close' }).click();
    await page
      .getByTestId(/^account-/)
      .filter({ hasText: 'samuel.osei@larkfield.example' })
      .getByText('Deactivated', { exact: true })
      .waitFor();

    // Samuel's open session ended with the deactivation.
    await samuelPage.reload();
    expect(new URL(samuelPage.url()).pathname).toBe('/signin');
    await elsewhere.close();
  });

  it('refuses to deactivate the director’s own account, saying why', async () => {
    await page.getByRole('button', { name: 'Manage Dr Ingrid Holm' }).click();
    const dialog = page.getByRole('dialog', { name: 'Dr Ingrid Holm' });
    await dialog.getByText('You cannot deactivate it yourself; another director can.').waitFor();
    await expect(dialog.getByRole('button', { name: /Deactivate/ }).count()).resolves.toBe(0);
    await page.keyboard.press('Escape');
    await dialog.waitFor({ state: 'hidden' });
  });

  it('filters the case list by the new cohort through the plain GET form', async () => {
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Cases' }).click();
    await page.waitForURL((u) => u.pathname === '/cases');
    await checkAndShoot(page, 'cases');
    const everyone = await page.getByRole('link', { name: /^Open the case of/ }).count();
    await page.getByLabel('Cohort', { exact: true }).selectOption({ label: COHORT });
    await Promise.all([
      page.waitForURL((u) => u.searchParams.has('cohort')),
      page.getByRole('button', { name: 'Show cases' }).click(),
    ]);
    const shown = page.getByRole('link', { name: /^Open the case of/ });
    const names = await page.locator('tbody tr td:first-child').allTextContents();
    expect(names.length).toBeGreaterThan(0);
    expect(new Set(names)).toEqual(new Set(['Priya Raman']));
    expect(await shown.count()).toBeLessThan(everyone);
    await checkAndShoot(page, 'cases-filtered');
    await shown.first().click();
    await page.waitForURL((u) => /^\/cases\/[0-9a-f-]{36}$/.test(u.pathname));
  });
});
