// The chairside shell and island offline: installable, a whole canal with no network, and a
// shared tablet that never sends one user's events as another's.
import { mkdirSync } from 'node:fs';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, launchPersistent } from '../helpers/browser';
import { DEMO } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';
import * as chairside from '../helpers/chairside';
import { tapScreen } from '../helpers/chairside';

// Invented scenario: an extracted lower left first molar (36), distal canal, CWL 20.5 mm,
// MAF 35, orifice 9.0 mm from the reference point (so a spreader at 12.5 mm no longer passes
// the coronal third).
let server: TestServer;
let browser: Browser;
beforeAll(async () => {
  mkdirSync('test-results', { recursive: true });
  [server, browser] = await Promise.all([startServer(), launchBrowser()]);
});
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

const { Driver, recordCanal, setUpDistal36, expectSlimDemoBanner, syncState, readQueuedIds } = chairside;
const openChairside = (page: Page, email: string, ready?: string) =>
  chairside.openChairside(page, server.baseUrl, email, ready);

describe('the chairside app shell', () => {
  it('is an installable app with our own icons, and opens with no network after one visit', async () => {
    const context = await launchPersistent({ viewport: { width: 1024, height: 768 } });
    try {
      const page = await context.newPage();
      await page.goto(`${server.baseUrl}/chairside`);
      await page.evaluate(async () => {
        await navigator.serviceWorker.ready;
      });
      const cdp = await context.newCDPSession(page);
      const { installabilityErrors } = (await cdp.send('Page.getInstallabilityErrors')) as {
        installabilityErrors: unknown[];
      };
      expect(installabilityErrors).toEqual([]);
      const manifest = (await (await page.request.get(`${server.baseUrl}/manifest.webmanifest`)).json()) as {
        icons: { src: string }[];
      };
      for (const icon of manifest.icons) expect((await page.request.get(server.baseUrl + icon.src)).status()).toBe(200);
      await page.reload();
      await context.setOffline(true);
      await page.reload();
      await expect(page.title()).resolves.toContain('Chairside');
      await page.getByRole('heading', { name: /Sign in/ }).waitFor();
    } finally {
      await context.close();
    }
  });
});

describe('the chairside island, offline first', () => {
  it('records a whole canal offline by taps, keeps it through a reload, and syncs it when back online', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
    const page = await context.newPage();
    await openChairside(page, DEMO.mira);
    // First visit installs the worker; the next load is controlled by it (registerType "prompt").
    await page.evaluate(async () => {
      await navigator.serviceWorker.ready;
    });
    await page.reload();
    await page.getByTestId('new-case').waitFor();
    expect(await page.evaluate(() => navigator.serviceWorker.controller !== null)).toBe(true);
    await expectSlimDemoBanner(page);

    await context.setOffline(true);
    await setUpDistal36(page);
    const d = new Driver(page);
    await recordCanal(d, { shortCone: true });
    expect(await syncState(page)).toBe('offline');
    const waiting = Number(await page.getByTestId('sync-state').getAttribute('data-waiting'));
    expect(waiting).toBeGreaterThanOrEqual(25);

    await page.reload();
    await page.locator('[data-testid="step"][data-card="done"]').waitFor();
    // Reloaded with no network: demo mode comes from what /api/me said last time.
    await expectSlimDemoBanner(page);
    await expect(page.getByTestId('tab-D').textContent()).resolves.toContain('seared');
    const diagram = page.getByTestId('canal-diagram');
    await expect(diagram.locator('[data-part="accessory"]').count()).resolves.toBe(4);
    await expect(diagram.locator('[data-part="removed"]').count()).resolves.toBe(1);
    await expect(diagram.locator('[data-part="spreader"]').count()).resolves.toBe(4);
    await expect(page.getByTestId('sync-state').getAttribute('data-waiting')).resolves.toBe(String(waiting));

    await context.setOffline(false);
    await page.locator('[data-testid="sync-state"][data-state="synced"]').waitFor({ timeout: 30_000 });
    await page.locator('[data-testid="findings-panel"][data-source="server"]').waitFor();
    await page.screenshot({ path: 'test-results/chairside-synced-1280x800.png', fullPage: true });
    await context.close();
  });

  it("never sends one user's unsent events under another user's session on the same browser", async () => {
    const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
    const page = await context.newPage();
    // Mira records while the sync cannot get through.
    await page.route('**/api/sync', (route) => route.abort('internetdisconnected'));
    await openChairside(page, DEMO.mira);
    await setUpDistal36(page);
    const d = new Driver(page);
    await d.answer('seat', 'Seats and holds');
    await d.ruler('taper', 19.5);
    const miraCase = await page.evaluate(() => JSON.stringify(localStorage)); // nothing there: data lives in IndexedDB
    expect(miraCase).toBe('{}');
    const miraIds: string[] = await page.evaluate(readQueuedIds);
    expect(miraIds.length).toBeGreaterThanOrEqual(4);

    await tapScreen(page, page.getByRole('button', { name: /Sign out/ }));
    await page.getByTestId('unsent-warning').waitFor();
    await tapScreen(page, page.getByRole('button', { name: 'Sign out anyway' }));
    await page.waitForURL((u) => u.pathname === '/signout');
    await tapScreen(page, page.getByRole('button', { name: 'Sign out of this device' }));
    await page.waitForURL((u) => u.pathname === '/signin');
    await page.unroute('**/api/sync');

    const sent: string[] = [];
    page.on('request', (r) => {
      if (r.url().endsWith('/api/sync')) sent.push(r.postData() ?? '');
    });
    await openChairside(page, DEMO.tomas);
    await tapScreen(page, page.getByTestId('new-case'));
    await tapScreen(page, page.getByRole('button', { name: 'Training block' }));
    await tapScreen(page, page.getByTestId('canals-confirm'));
    await tapScreen(page, page.getByTestId('ruler-cwl').locator('button[data-mm="18"]'));
    await tapScreen(page, page.getByTestId('maf-30'));
    await tapScreen(page, page.getByTestId('save-canal'));
    await new Driver(page).answer('seat', 'Seats and holds');
    await tapScreen(page, page.getByRole('button', { name: 'Sync now' }));
    await page.locator('[data-testid="sync-state"][data-state="synced"]').waitFor({ timeout: 30_000 });
    expect(sent.length).toBeGreaterThan(0);
    for (const body of sent) for (const id of miraIds) expect(body).not.toContain(id);
    // Mira's events are still on the tablet, unsent.
    expect((await page.evaluate(readQueuedIds)).sort()).toEqual([...miraIds].sort());

    // Tomas signs out with everything synced; Mira signs in again and her events go out.
    await tapScreen(page, page.getByRole('button', { name: /Sign out/ }));
    await page.waitForURL((u) => u.pathname === '/signout');
    await tapScreen(page, page.getByRole('button', { name: 'Sign out of this device' }));
    await page.waitForURL((u) => u.pathname === '/signin');
    await openChairside(page, DEMO.mira, 'step');
    await page.locator('[data-testid="sync-state"][data-state="synced"]').waitFor({ timeout: 30_000 });
    expect(await page.evaluate(readQueuedIds)).toEqual([]);
    await context.close();
  });
});
