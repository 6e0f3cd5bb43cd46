import AxeBuilder from '@axe-core/playwright';
import { mkdirSync } from 'node:fs';
import type { Browser, BrowserContext, Locator, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, launchPersistent, signIn } from '../helpers/browser';
import { DEMO } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';
import knexFactory from 'knex';
import { sqliteOptions } from '../../src/lib/server/knex-options';

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

/** Drives the island by taps and counts them. */
class Driver {
  taps = 0;
  constructor(readonly page: Page) {}
  step(): Locator {
    return this.page.getByTestId('step');
  }
  async tap(l: Locator): Promise<void> {
    await l.click();
    this.taps++;
  }
  async card(kind: string): Promise<void> {
    await this.page.locator(`[data-testid="step"][data-card="${kind}"]`).waitFor({ timeout: 20_000 });
  }
  async answer(kind: string, name: string): Promise<void> {
    await this.card(kind);
    await this.tap(this.step().getByRole('button', { name, exact: true }));
  }
  async ruler(kind: string, mm: number, testId = 'ruler'): Promise<void> {
    await this.card(kind);
    await this.tap(this.step().getByTestId(testId).locator(`button[data-mm="${mm}"]`));
  }
}

async function openChairside(page: Page, email: string, ready = 'new-case'): Promise<void> {
  await signIn(page, server.baseUrl, email, DEMO.password, '/chairside');
  if (new URL(page.url()).pathname !== '/chairside') await page.goto(`${server.baseUrl}/chairside`);
  try {
    await page.getByTestId(ready).waitFor();
  } catch (e) {
    await page.screenshot({ path: `test-results/chairside-failed-open-${email.split('.')[0]}.png` });
    throw e;
  }
}

/** Opens tooth 36 with only the distal canal and sets it up (not counted as canal taps). */
async function setUpDistal36(page: Page): Promise<void> {
  await page.getByTestId('new-case').click();
  await page.getByRole('button', { name: 'Extracted tooth' }).click();
  await page.getByTestId('quadrant-3').click();
  await page.getByTestId('tooth-36').click();
  await page.getByTestId('canal-MB').click();
  await page.getByTestId('canal-ML').click();
  await page.getByTestId('canals-confirm').click();
  await page.getByTestId('ruler-cwl').locator('button[data-mm="20.5"]').click();
  await page.getByTestId('maf-35').click();
  await page.getByTestId('ruler-orifice').locator('button[data-mm="9"]').click();
  await page.getByTestId('save-canal').click();
  await page.locator('[data-testid="step"][data-card="seat"]').waitFor();
}

/** A whole canal by taps, with the tablet's default answers; optionally one short cone redone. */
async function recordCanal(d: Driver, opts: { shortCone: boolean; check?: () => Promise<void> }): Promise<void> {
  const check = opts.check ?? (async () => {});
  await d.answer('seat', 'Seats and holds');
  await check();
  await d.ruler('taper', 19.5);
  await check();
  await d.answer('radiograph', 'Taken');
  await d.answer('rinse', 'Done');
  await check();
  await d.ruler('dry', 20.5);
  await check();
  await d.ruler('master', 20.5, 'ruler-master');
  await d.answer('master', 'Reached');
  await check();
  await d.answer('radiograph', 'Taken');
  await d.answer('seal', 'Seated');
  await check();
  const depths = [18.5, 16.5, 14.5, 12.5];
  for (const [i, depth] of depths.entries()) {
    await d.ruler('spreader', depth);
    if (i === 0) await check();
    if (opts.shortCone && i === 1) {
      await d.answer('accessory', 'Stopped short');
      await d.answer('remove', 'Removed');
      await check();
      await d.card('accessory');
      await expect(d.step().locator('#step-title').textContent()).resolves.toContain('Place another cone at 16.5 mm');
    }
    await d.answer('accessory', 'Reached');
    if (i === 0) await check();
  }
  await d.card('spreader');
  await d.page.getByTestId('compaction-complete').waitFor();
  await d.answer('spreader', 'Finish compaction');
  await d.answer('fill', 'Radiograph taken');
  await check();
  await d.tap(d.step().getByRole('button', { name: 'Flush' }));
  await d.tap(d.step().getByRole('button', { name: 'None' }));
  await d.answer('sear', 'At the orifice');
  await check();
  await d.answer('compact', 'Done');
  await d.answer('clean', 'Done');
  await d.card('done');
  await check();
}

/** Interactive elements smaller than 56 × 56 px (64 for ruler buttons and one-tap answers). */
async function undersized(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const out: string[] = [];
    for (const el of document.querySelectorAll<HTMLElement>(
      'button, a[href], input, select, textarea, [role="button"], [tabindex]',
    )) {
      const r = el.getBoundingClientRect();
      if (r.width === 0 && r.height === 0) continue; // not rendered
      const big = el.closest('[data-testid^="ruler"]') || el.className.includes('min-h-16');
      const min = big ? 64 : 56;
      if (r.width < min - 0.5 || r.height < min - 0.5)
        out.push(
          `${el.tagName} "${el.textContent?.trim().slice(0, 30)}" ${Math.round(r.width)}×${Math.round(r.height)} < ${min}`,
        );
    }
    return out;
  });
}

async function seriousViolations(page: Page): Promise<string[]> {
  const result = await new AxeBuilder({ page }).analyze();
  return result.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).join(', ')})`);
}

/** The demo banner is there, and adds no more than one slim line to the top bar. */
async function expectSlimDemoBanner(page: Page): Promise<void> {
  const banner = page.getByRole('banner').getByTestId('demo-banner');
  await expect(banner.textContent()).resolves.toContain('Demo clinic');
  expect((await banner.boundingBox())!.height).toBeLessThanOrEqual(28);
}

async function syncState(page: Page): Promise<string | null> {
  return page.getByTestId('sync-state').getAttribute('data-state');
}

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

    await page.getByRole('button', { name: /Sign out/ }).click();
    await page.getByTestId('unsent-warning').waitFor();
    await page.getByRole('button', { name: 'Sign out anyway' }).click();
    await page.waitForURL((u) => u.pathname === '/signout');
    await page.getByRole('button', { name: 'Sign out of this device' }).click();
    await page.waitForURL((u) => u.pathname === '/signin');
    await page.unroute('**/api/sync');

    const sent: string[] = [];
    page.on('request', (r) => {
      if (r.url().endsWith('/api/sync')) sent.push(r.postData() ?? '');
    });
    await openChairside(page, DEMO.tomas);
    await page.getByTestId('new-case').click();
    await page.getByRole('button', { name: 'Training block' }).click();
    await page.getByTestId('canals-confirm').click();
    await page.getByTestId('ruler-cwl').locator('button[data-mm="18"]').click();
    await page.getByTestId('maf-30').click();
    await page.getByTestId('save-canal').click();
    await new Driver(page).answer('seat', 'Seats and holds');
    await page.getByRole('button', { name: 'Sync now' }).click();
    await page.locator('[data-testid="sync-state"][data-state="synced"]').waitFor({ timeout: 30_000 });
    expect(sent.length).toBeGreaterThan(0);
    for (const body of sent) for (const id of miraIds) expect(body).not.toContain(id);
    // Mira's events are still on the tablet, unsent.
    expect((await page.evaluate(readQueuedIds)).sort()).toEqual([...miraIds].sort());

    // Tomas signs out with everything synced; Mira signs in again and her events go out.
    await page.getByRole('button', { name: /Sign out/ }).click();
    await page.waitForURL((u) => u.pathname === '/signout');
    await page.getByRole('button', { name: 'Sign out of this device' }).click();
    await page.waitForURL((u) => u.pathname === '/signin');
    await openChairside(page, DEMO.mira, 'step');
    await page.locator('[data-testid="sync-state"][data-state="synced"]').waitFor({ timeout: 30_000 });
    expect(await page.evaluate(readQueuedIds)).toEqual([]);
    await context.close();
  });
});

/** In the page: ids of every queued event on this tablet, whoever recorded them. */
function readQueuedIds(): Promise<string[]> {
  return new Promise((resolve, reject) => {
    const open = indexedDB.open('coneline-chairside');
    open.onerror = () => reject(open.error);
    open.onsuccess = () => {
      const req = open.result.transaction('events').objectStore('events').getAll();
      req.onsuccess = () => {
        resolve(
          (req.result as { state: string; event: { id: string } }[])
            .filter((r) => r.state === 'queued')
            .map((r) => r.event.id),
        );
        open.result.close();
      };
    };
  });
}

describe('the chairside island for gloved hands', () => {
  async function newSession(width: number, height: number): Promise<{ context: BrowserContext; page: Page }> {
    const context = await browser.newContext({ viewport: { width, height } });
    const page = await context.newPage();
    await openChairside(page, DEMO.priya);
    return { context, page };
  }

  it('fills a canal of an extracted tooth with four accessory cones in no more than 25 taps after set-up', async () => {
    const { context, page } = await newSession(1280, 800);
    await setUpDistal36(page);
    const d = new Driver(page);
    await recordCanal(d, { shortCone: false });
    expect(d.taps).toBeLessThanOrEqual(25);
    expect(d.taps).toBe(24);
    await context.close();
  });

  it('keeps the screen awake while a canal is open, asking again when the page is shown again', async () => {
    const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
    // A stand-in Wake Lock that counts requests; the browser releases the lock when the page hides.
    await context.addInitScript(() => {
      const w = window as unknown as { wakeRequests: number; lastSentinel?: { released: boolean } };
      w.wakeRequests = 0;
      Object.defineProperty(navigator, 'wakeLock', {
        value: {
          request: async () => {
            w.wakeRequests++;
            const s = {
              released: false,
              release: async () => {
                s.released = true;
              },
            };
            w.lastSentinel = s;
            return s;
          },
        },
      });
    });
    const page = await context.newPage();
    await openChairside(page, DEMO.priya);
    expect(await page.evaluate(() => (window as unknown as { wakeRequests: number }).wakeRequests)).toBe(0);
    await setUpDistal36(page);
    await expect.poll(() => page.evaluate(() => (window as unknown as { wakeRequests: number }).wakeRequests)).toBe(1);
    await page.evaluate(() => {
      (window as unknown as { lastSentinel: { released: boolean } }).lastSentinel.released = true;
      document.dispatchEvent(new Event('visibilitychange'));
    });
    await expect.poll(() => page.evaluate(() => (window as unknown as { wakeRequests: number }).wakeRequests)).toBe(2);
    await context.close();
  });

  it("withdraws an answer from the canal's timeline and asks that step again", async () => {
    const { context, page } = await newSession(1024, 768);
    await setUpDistal36(page);
    const d = new Driver(page);
    await d.answer('seat', 'Seats and holds');
    await d.ruler('taper', 19.5);
    await d.answer('radiograph', 'Taken');
    await d.card('rinse');
    await page.getByRole('button', { name: /^Timeline/ }).click();
    const row = page.getByTestId('timeline').getByRole('listitem').filter({ hasText: 'Taper check' });
    await row.getByRole('button', { name: 'Withdraw' }).click();
    await d.card('taper');
    await expect(
      page.getByTestId('timeline').getByRole('listitem').filter({ hasText: 'Taper check' }).count(),
    ).resolves.toBe(0);
    expect(await undersized(page)).toEqual([]);
    expect(await seriousViolations(page)).toEqual([]);
    await d.ruler('taper', 19);
    await d.card('rinse');
    await context.close();
  });

  it('corrects the CWL from the canal card, and the next rulers centre on the new length', async () => {
    const { context, page } = await newSession(1024, 768);
    await setUpDistal36(page);
    const d = new Driver(page);
    await d.answer('seat', 'Seats and holds');
    await d.card('taper');
    // Set up at 20.5 mm: the taper ruler expects CWL − 1 = 19.5.
    await expect(
      d.step().getByTestId('ruler').locator('button[data-mm="19.5"]').getAttribute('aria-label'),
    ).resolves.toContain('expected');
    await page.getByRole('button', { name: 'Correct the CWL (20.5 mm)' }).click();
    await page.getByRole('button', { name: 'apex locator' }).click();
    await page.getByTestId('cwl-ruler').locator('button[data-mm="21.5"]').click();
    await page.getByRole('button', { name: 'Correct the CWL (21.5 mm)' }).waitFor();
    await expect(
      d.step().getByTestId('ruler').locator('button[data-mm="20.5"]').getAttribute('aria-label'),
    ).resolves.toContain('expected');
    await page.getByRole('button', { name: /^Timeline/ }).click();
    await expect(page.getByTestId('timeline').textContent()).resolves.toContain('CWL corrected to 21.5');
    expect(await undersized(page)).toEqual([]);
    expect(await seriousViolations(page)).toEqual([]);
    await context.close();
  });

  it('shows an answer the server refused, with its reason, until the student dismisses it', async () => {
    const { context, page } = await newSession(1024, 768);
    await setUpDistal36(page);
    const d = new Driver(page);
    await d.answer('seat', 'Seats and holds');
    await page.locator('[data-testid="sync-state"][data-state="synced"]').waitFor({ timeout: 30_000 });
    // Meanwhile the case is signed off on the server: it takes no more answers.
    const k = knexFactory(sqliteOptions(server.dbFile));
    try {
      const row = (await k('cases')
        .join('users', 'users.id', 'cases.student_id')
        .where('users.email', DEMO.priya)
        .orderBy('cases.opened_at', 'desc')
        .first('cases.id')) as { id: string };
      await k('cases').where({ id: row.id }).update({ review_status: 'approved' });
    } finally {
      await k.destroy();
    }
    await d.ruler('taper', 19.5);
    const refused = page.getByTestId('rejected');
    await refused.waitFor({ timeout: 30_000 });
    await expect(refused.textContent()).resolves.toContain('signed off');
    await expect(refused.textContent()).resolves.toContain('Taper check');
    expect(await undersized(page)).toEqual([]);
    expect(await seriousViolations(page)).toEqual([]);
    await expect(refused.getByRole('listitem').count()).resolves.toBe(1);
    await refused.getByRole('button', { name: 'Dismiss' }).click();
    await refused.waitFor({ state: 'detached' });
    await context.close();
  });

  it("opens a patient's tooth by chart number, the only typed entry", async () => {
    const { context, page } = await newSession(768, 1024);
    await page.getByTestId('new-case').click();
    await page.getByRole('button', { name: 'Patient' }).click();
    await page.getByTestId('quadrant-2').click();
    await page.getByTestId('tooth-21').click();
    await page.getByRole('textbox', { name: 'Chart number' }).fill('  TST-5521 ');
    await page.getByRole('button', { name: 'Open case' }).click();
    await page.getByTestId('canals-confirm').click();
    await page.getByTestId('ruler-cwl').locator('button[data-mm="22.5"]').click();
    await page.getByTestId('maf-50').click();
    await page.getByTestId('save-canal').click();
    await page.locator('[data-testid="step"][data-card="seat"]').waitFor();
    await page.locator('[data-testid="sync-state"][data-state="synced"]').waitFor({ timeout: 30_000 });
    const k = knexFactory(sqliteOptions(server.dbFile));
    try {
      const row = await k('cases').where({ chart_ref: 'TST-5521' }).first('setting', 'tooth');
      expect(row).toEqual({ setting: 'patient', tooth: 21 });
    } finally {
      await k.destroy();
    }
    await context.close();
  });

  it.each([
    [768, 1024],
    [1024, 768],
    [1280, 800],
    [800, 1280],
  ])(
    'keeps every control at least 56 px, passes axe, and lays out at %i × %i',
    async (width, height) => {
      const { context, page } = await newSession(width, height);
      const problems: string[] = [];
      const check = async () => {
        problems.push(...(await undersized(page)));
        problems.push(...(await seriousViolations(page)));
      };
      await check();
      await setUpDistal36(page);
      const d = new Driver(page);
      let shot = 0;
      await recordCanal(d, {
        shortCone: true,
        check: async () => {
          await check();
          if (shot++ % 4 === 0)
            await page.screenshot({ path: `test-results/chairside-${width}x${height}-${shot}.png` });
        },
      });
      await page.getByRole('button', { name: 'Finish the tooth' }).click();
      await check();
      await page.screenshot({ path: `test-results/chairside-${width}x${height}-summary.png`, fullPage: true });
      expect([...new Set(problems)]).toEqual([]);
      await context.close();
    },
    120_000,
  );
});
