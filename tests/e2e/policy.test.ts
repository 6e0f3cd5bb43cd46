// In Chromium, with the server's Content-Security-Policy in force: every page loads and
// hydrates without a single policy violation, and the chairside installs its service
// worker and opens offline.
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchPersistent, signIn } from '../helpers/browser';
import { DEMO } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let context: BrowserContext;
beforeAll(async () => {
  server = await startServer();
  context = await launchPersistent({ viewport: { width: 1024, height: 768 } });
  // Collected in every document before any of its own scripts run.
  await context.addInitScript(() => {
    const seen: string[] = [];
    (window as unknown as { __violations: string[] }).__violations = seen;
    document.addEventListener('securitypolicyviolation', (e) => seen.push(`${e.violatedDirective} ${e.blockedURI}`));
  });
});
afterAll(async () => {
  await context?.close();
  await server?.stop();
});

const violations = (page: Page) => page.evaluate(() => (window as unknown as { __violations: string[] }).__violations);

async function visit(page: Page, path: string): Promise<void> {
  await page.goto(server.baseUrl + path);
  await page.waitForLoadState('networkidle');
  expect(await violations(page), path).toEqual([]);
}

describe('the content security policy in Chromium', () => {
  it('lets every page a student uses load and run, online and offline, with no violation', async () => {
    const page = await context.newPage();
    const consoleErrors: string[] = [];
    page.on('console', (m) => {
      if (m.type() === 'error' && /Content Security Policy/i.test(m.text())) consoleErrors.push(m.text());
    });
    await visit(page, '/signin');
    await signIn(page, server.baseUrl, DEMO.mira, DEMO.password);
    expect(await violations(page)).toEqual([]);
    for (const path of ['/', '/account', '/signout']) await visit(page, path);
    const caseLink = page.locator('a[href^="/cases/"]').first();
    await page.goto(server.baseUrl + '/');
    await visit(page, (await caseLink.getAttribute('href'))!);

    await visit(page, '/chairside');
    await page.evaluate(async () => {
      await navigator.serviceWorker.ready;
    });
    await page.reload();
    await page.getByTestId('new-case').waitFor();
    expect(await page.evaluate(() => navigator.serviceWorker.controller !== null)).toBe(true);
    expect(await violations(page)).toEqual([]);

    await context.setOffline(true);
    await page.reload();
    await page.getByTestId('new-case').waitFor();
    expect(await violations(page)).toEqual([]);
    await context.setOffline(false);
    expect(consoleErrors).toEqual([]);
    await page.close();
  });

  it('lets a director’s pages load with no violation', async () => {
    const page = await context.newPage();
    await page.goto(`${server.baseUrl}/signout`);
    const out = page.getByRole('button', { name: 'Sign out of this device' });
    if (await out.count()) await Promise.all([page.waitForURL(/signin/), out.click()]);
    await signIn(page, server.baseUrl, DEMO.ingrid, DEMO.password);
    for (const path of ['/', '/admin', '/admin/settings', '/admin/audit', '/account']) await visit(page, path);
    await page.close();
  });
});
