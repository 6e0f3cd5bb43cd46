// The review queue in Chromium (docs/review.md, "The queue"): the seeded attending finds a
// submitted case on a phone and on a desktop, filters, searches a chart number without it
// reaching the page's address, opens the case, and decides cone-fit items; no horizontal
// scroll, large tap targets, axe clean. Screenshots land in test-results/.
import AxeBuilder from '@axe-core/playwright';
import type { Knex } from 'knex';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, signIn } from '../helpers/browser';
import { DEMO } from '../helpers/client';
import { addEvent, openDb, userId } from '../helpers/queue-db';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let browser: Browser;
let k: Knex;
beforeAll(async () => {
  [server, browser] = await Promise.all([startServer(), launchBrowser()]);
  k = openDb(server.dbFile);
});
afterAll(async () => {
  await k?.destroy();
  await browser?.close();
  await server?.stop();
});

async function axeViolations(page: Page): Promise<string[]> {
  const { violations } = await new AxeBuilder({ page }).analyze();
  return violations.map((v) => `${v.id} (${v.impact}): ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`);
}
const horizontalOverflow = (page: Page) =>
  page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
/** Controls of the queue smaller than 44 px in either direction (the page's own, not the top bar's). */
const smallTargets = (page: Page) =>
  page.evaluate(() =>
    [...document.querySelectorAll('main astro-island :is(button, select, input, a)')]
      .filter((el) => (el as HTMLElement).offsetParent !== null)
      .map((el) => ({ el, r: el.getBoundingClientRect() }))
      .filter(({ r }) => r.height < 44 || r.width < 44)
      .map(({ el, r }) => `${el.tagName} "${el.textContent?.trim()}" ${Math.round(r.width)}×${Math.round(r.height)}`),
  );
/** The island has hydrated once Astro drops its `ssr` mark. */
const hydrated = (page: Page) => page.locator('astro-island:not([ssr])').first().waitFor({ state: 'attached' });

async function openQueue(width: number, height: number) {
  const context = await browser.newContext({ viewport: { width, height } });
  const page = await context.newPage();
  const problems: string[] = [];
  page.on('console', (m) => {
    if (m.type() === 'error') problems.push(m.text());
  });
  page.on('pageerror', (e) => problems.push(e.message));
  const queries: string[] = [];
  page.on('request', (r) => {
    if (r.url().includes('/api/review/queue')) queries.push(r.url());
  });
  await signIn(page, server.baseUrl, DEMO.helen, DEMO.password);
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Review queue' }).click();
  await page.waitForURL((u) => u.pathname === '/review');
  await hydrated(page);
  return { context, page, problems, queries };
}

describe('the review queue', () => {
  for (const [width, height] of [
    [390, 844],
    [1280, 800],
  ] as const) {
    it(`shows the attending a submitted case, filters and searches it, and opens it at ${width}×${height}`, async () => {
      const { context, page, problems, queries } = await openQueue(width, height);
      const phone = width < 768;
      await expect(page.getByRole('heading', { name: 'Review queue', level: 1 }).isVisible()).resolves.toBe(true);
      // Rendered on the server: the submitted cases are there before any request of the island's.
      const incisor = phone
        ? page.getByRole('listitem').filter({ hasText: 'Tomas Lindqvist' }).filter({ hasText: 'Tooth 21' })
        : page.getByRole('row').filter({ hasText: 'Tomas Lindqvist' }).filter({ hasText: '21' });
      const miras = (phone ? page.getByLabel('Cases in the review queue').getByRole('listitem') : page.getByRole('row'))
        .filter({ hasText: 'Mira Okafor' })
        .first();
      await incisor.waitFor();
      await expect(incisor.textContent()).resolves.toContain('Waiting for review');
      await miras.waitFor();
      expect(await horizontalOverflow(page)).toBeLessThanOrEqual(0);
      expect(await smallTargets(page)).toEqual([]);
      expect(await axeViolations(page)).toEqual([]);
      await page.screenshot({ path: `test-results/review-queue-${width}x${height}.png`, fullPage: true });

      // Filters go to the API: only Tomas's cases are left.
      await page.getByLabel('Student').selectOption({ label: 'Tomas Lindqvist' });
      await miras.waitFor({ state: 'detached' });
      expect(queries.some((q) => /[?&]student=\d+/.test(q))).toBe(true);
      await incisor.waitFor();

      // A chart number, by its beginning in small letters: sent to the API, never to the page's address.
      await page.getByLabel('Student').selectOption({ label: 'Any student' });
      await page.getByLabel('Chart number').fill('lk-405');
      await page.getByRole('button', { name: 'Search' }).click();
      await miras.waitFor({ state: 'detached' });
      await expect(incisor.textContent()).resolves.toContain('LK-40517');
      expect(queries.some((q) => q.includes('q=lk-405'))).toBe(true);
      expect(page.url()).not.toMatch(/lk-405/i);
      await page.getByLabel('Chart number').fill('ZZ-0');
      await page.getByRole('button', { name: 'Search' }).click();
      await page.getByText('No case matches these filters.').waitFor();
      await page.getByRole('button', { name: 'Clear' }).click();
      await incisor.waitFor();

      if (!phone) {
        // The table's headers sort on the server.
        await page.getByRole('button', { name: /^Tooth/ }).click();
        await page.waitForFunction(() =>
          [...document.querySelectorAll('th')].some(
            (th) => th.getAttribute('aria-sort') === 'ascending' && th.textContent!.includes('Tooth'),
          ),
        );
        expect(queries.some((q) => q.includes('sort=tooth'))).toBe(true);
      }

      await incisor.getByRole('link', { name: /Open Tomas Lindqvist's case, tooth 21/ }).click();
      await page.waitForURL((u) => /^\/cases\/[0-9a-f-]{36}$/.test(u.pathname));
      expect(await horizontalOverflow(page)).toBeLessThanOrEqual(0);
      expect(problems).toEqual([]);
      await context.close();
    });
  }

  it('lets the attending return, confirm and approve cone fits on a phone, and says when a case changed first', async () => {
    const molar = (await k('cases').where({ tooth: 36 }).first('id', 'student_id'))!;
    const canals = Object.fromEntries(
      (await k('canals').where({ case_id: molar.id }).select('id', 'name')).map((c) => [c.name, c.id as string]),
    );
    const helen = await userId(k, DEMO.helen);
    const ev = (canal: string, type: string, data: Record<string, unknown> = {}) =>
      addEvent(
        k,
        { caseId: molar.id, canalId: canals[canal]!, userId: molar.student_id, type, data },
        new Date().toISOString(),
      );

    await ev('MB', 'conefit.requested');
    const { context, page, problems } = await openQueue(390, 844);
    const items = page.getByRole('region', { name: /Cone fits waiting/ });
    await expect(items.getByRole('heading').textContent()).resolves.toBe('Cone fits waiting (1)');
    await expect(items.textContent()).resolves.toContain('Mira Okafor · tooth 36 · canal MB');
    expect(await horizontalOverflow(page)).toBeLessThanOrEqual(0);
    expect(await smallTargets(page)).toEqual([]);
    expect(await axeViolations(page)).toEqual([]);
    await page.screenshot({ path: 'test-results/review-queue-conefit-390x844.png', fullPage: true });

    // A return needs words for the student.
    await items.getByRole('button', { name: /^Return: Mira Okafor/ }).click();
    await items.getByRole('button', { name: 'Send the return' }).click();
    await items.getByRole('alert').waitFor();
    await items.getByLabel('What should the student put right?').fill('The cone binds 1 mm short: re-check the MAF.');
    expect(await axeViolations(page)).toEqual([]);
    await page.screenshot({ path: 'test-results/review-queue-return-390x844.png', fullPage: true });
    await items.getByRole('button', { name: 'Send the return' }).click();
    const returnedNotice = page.getByRole('status').filter({ hasText: 'Cone fit of canal MB' });
    await returnedNotice.waitFor();
    await expect(returnedNotice.textContent()).resolves.toContain('returned');
    await items.waitFor({ state: 'detached' });
    const returned = await k('signoffs').where({ case_id: molar.id, checkpoint: 'cone-fit' }).first();
    expect(returned).toMatchObject({ canal_id: canals.MB, decision: 'returned', attending_id: helen });

    // An approval at the chair arrives while the page is open: the 15 s refresh shows it.
    await ev('D', 'conefit.approvedAtChair', { attendingId: String(helen) });
    await items.getByText(/Approved at the chair by Dr Helen Vasquez, not yet confirmed/).waitFor({ timeout: 25_000 });
    await items.getByRole('button', { name: /^Confirm: Mira Okafor/ }).click();
    const confirmedNotice = page.getByRole('status').filter({ hasText: 'Cone fit of canal D' });
    await confirmedNotice.waitFor();
    await expect(confirmedNotice.textContent()).resolves.toContain('confirmed');

    // The student submits before the attending taps: nothing is signed, and the page says why.
    await ev('ML', 'conefit.requested');
    await page.reload();
    await hydrated(page);
    await items.getByText('canal ML').waitFor();
    await k('cases')
      .where({ id: molar.id })
      .update({ review_status: 'submitted', submitted_at: new Date().toISOString() });
    await items.getByRole('button', { name: /^Approve cone fit: Mira Okafor/ }).click();
    const changed = page.getByRole('status').filter({ hasText: 'Nothing was signed' });
    await changed.waitFor();
    await expect(changed.textContent()).resolves.toContain('"Waiting for review"');
    expect(await k('signoffs').where({ case_id: molar.id, canal_id: canals.ML }).first()).toBeUndefined();
    // Reloaded: the item is still there, now on a submitted case, and can be approved.
    await page
      .getByLabel('Cases in the review queue')
      .getByRole('listitem')
      .filter({ hasText: 'Tooth 36' })
      .filter({ hasText: 'Waiting for review' })
      .waitFor();
    await items.getByRole('button', { name: /^Approve cone fit: Mira Okafor/ }).click();
    await page.getByRole('status').filter({ hasText: 'approved' }).waitFor();
    expect(await k('signoffs').where({ case_id: molar.id, canal_id: canals.ML }).first()).toMatchObject({
      decision: 'approved',
    });
    // The browser logs the 409 it was answered; nothing else went wrong.
    expect(problems.filter((p) => !p.includes('status of 409'))).toEqual([]);
    await context.close();
  });
});
