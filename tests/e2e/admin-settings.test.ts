// The director's settings and audit log in Chromium (docs/settings.md): a tolerance changed, a
// second tab's stale change shown and reloaded, a value out of range refused beside its field,
// the re-judging run to the end, the change found in the audit log and exported as CSV; an
// attending reads the settings without a form; both pages axe clean.
import AxeBuilder from '@axe-core/playwright';
import { mkdirSync, readFileSync } from 'node:fs';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, signIn } from '../helpers/browser';
import { DEMO } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let browser: Browser;
let director: BrowserContext;
beforeAll(async () => {
  mkdirSync('test-results', { recursive: true });
  [server, browser] = await Promise.all([startServer(), launchBrowser()]);
  director = await browser.newContext({ viewport: { width: 1280, height: 900 }, acceptDownloads: true });
});
afterAll(async () => {
  await director?.close();
  await browser?.close();
  await server?.stop();
});

async function axe(page: Page): Promise<string[]> {
  const result = await new AxeBuilder({ page }).analyze();
  return result.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).join(', ')})`);
}

/** The settings page, hydrated (the form answers only once React runs). */
async function settingsPage(page: Page): Promise<void> {
  await page.goto(`${server.baseUrl}/admin/settings`);
  await page.locator('astro-island:not([ssr])').first().waitFor({ state: 'attached' });
  await page.getByTestId('recompute-status').locator('progress').waitFor();
}

const field = (page: Page, name: string) => page.locator(`input#${name}`);

describe('the course settings page', () => {
  it('lets a director change a tolerance and shows a second tab’s stale change, with a reload', async () => {
    const page = await director.newPage();
    await signIn(page, server.baseUrl, DEMO.ingrid, DEMO.password, '/admin/settings');
    await settingsPage(page);
    expect(await axe(page)).toEqual([]);
    await expect.poll(() => page.getByRole('heading', { name: 'Tolerances of the checks' }).count()).toBe(1);
    const row = page.locator('tr[data-setting="minAccessoryCones"]');
    expect(await row.textContent()).toContain('0–10 cones');
    expect(await row.textContent()).toContain('Coneline (judgement)');
    expect(await page.locator('tr[data-setting="requiredPatientCanals"]').textContent()).toContain('school policy');

    // A second tab, loaded now: it will hold version 1 when the first has saved version 2.
    const other = await director.newPage();
    await settingsPage(other);

    // Out of range: refused beside the field, before anything is sent.
    await field(page, 'fallbackStopDepthMm').fill('20');
    await page.getByRole('button', { name: 'Save the changed values' }).click();
    await expect
      .poll(() => page.locator('[data-error-for="fallbackStopDepthMm"]').textContent())
      .toBe('fallbackStopDepthMm must lie between 8 and 16 mm');
    await field(page, 'fallbackStopDepthMm').fill('12');

    await field(page, 'minAccessoryCones').fill('4');
    await page.getByRole('button', { name: 'Save the changed values' }).click();
    await expect.poll(() => page.getByTestId('settings-status').textContent()).toMatch(/^Saved as version \d+\./);

    await field(other, 'firstSpreaderMarginMm').fill('1.5');
    await other.getByRole('button', { name: 'Save the changed values' }).click();
    const conflict = other.getByTestId('settings-conflict');
    await conflict.waitFor();
    expect(await conflict.textContent()).toContain('Someone changed the settings since you loaded them');
    expect(await conflict.textContent()).toContain(
      'How far short of the CWL the first spreader placement may stop: 1.5',
    );
    await other.screenshot({ path: 'test-results/admin-settings-conflict.png', fullPage: true });
    await other.getByRole('button', { name: 'Reload the settings' }).click();
    await expect.poll(() => field(other, 'minAccessoryCones').inputValue()).toBe('4');
    await expect.poll(() => field(other, 'firstSpreaderMarginMm').inputValue()).toBe('2');
    await other.close();
    await page.close();
  });

  it('runs the re-judging from the button to its end and shows its progress', async () => {
    const page = await director.newPage();
    await settingsPage(page);
    // The run the save started has finished; the button starts a new one, which finishes too.
    const status = page.getByTestId('recompute-status');
    await expect.poll(() => status.getAttribute('data-finished'), { timeout: 30_000 }).toBe('true');
    const before = await status.getAttribute('data-started-at');
    await page.getByRole('button', { name: 'Recompute all canals' }).click();
    await expect
      .poll(
        async () => [
          (await status.getAttribute('data-started-at')) !== before,
          await status.getAttribute('data-finished'),
        ],
        {
          timeout: 30_000,
        },
      )
      .toEqual([true, 'true']);
    const progress = status.locator('progress');
    expect(await progress.getAttribute('value')).toBe(await progress.getAttribute('max'));
    expect(await status.textContent()).toMatch(/(\d+) of \1 canals judged/);
    expect(await status.textContent()).toMatch(/Started .*Finished /);
    await page.screenshot({ path: 'test-results/admin-settings.png', fullPage: true });
    expect(await axe(page)).toEqual([]);
    await page.close();
  });

  it('finds the change in the audit log, filtered with the form, and exports it as CSV', async () => {
    const page = await director.newPage();
    await page.goto(`${server.baseUrl}/admin/audit`);
    expect(await axe(page)).toEqual([]);
    await page.getByLabel('What').selectOption({ label: 'Changed the course settings' });
    await page.getByRole('button', { name: 'Show' }).click();
    await page.waitForURL(/action=settings.change/);
    const rows = page.locator('tr[data-audit-id]');
    expect(await rows.count()).toBe(1);
    expect(await rows.first().textContent()).toContain('minAccessoryCones: 3 → 4');
    expect(await rows.first().textContent()).toContain('Dr Ingrid Holm');
    await page.screenshot({ path: 'test-results/admin-audit.png', fullPage: true });
    expect(await axe(page)).toEqual([]);

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('link', { name: 'Export these lines as CSV' }).click(),
    ]);
    expect(download.suggestedFilename()).toMatch(/^coneline-audit-\d{4}-\d{2}-\d{2}\.csv$/);
    const csv = readFileSync((await download.path())!, 'utf8')
      .trim()
      .split('\n');
    expect(csv[0]).toBe(
      'id,at_utc,at_clinic,actor_id,actor,action,action_words,subject_type,subject_id,subject_name,detail',
    );
    expect(csv).toHaveLength(2);
    expect(csv[1]).toContain('settings.change');
    await page.close();
  });

  it('shows an attending the settings to read, with no form and no button', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signIn(page, server.baseUrl, DEMO.helen, DEMO.password, '/admin/settings');
    await page.getByRole('heading', { name: 'Course settings' }).waitFor();
    expect(await page.locator('tr[data-setting="minAccessoryCones"]').textContent()).toContain('4 cones');
    expect(await page.locator('input, select').count()).toBe(0);
    expect(await page.getByRole('button', { name: /Save|Recompute/ }).count()).toBe(0);
    expect(await axe(page)).toEqual([]);
    await context.close();
  });
});
