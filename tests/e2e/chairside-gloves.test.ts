// The chairside island for gloved hands: the tap budget, wake lock, withdrawing and correcting,
// refused answers, and the patient path.
import { mkdirSync } from 'node:fs';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser } from '../helpers/browser';
import { DEMO } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';
import knexFactory from 'knex';
import { sqliteOptions } from '../../src/lib/server/knex-options';
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

const { Driver, recordCanal, setUpDistal36, undersized, seriousViolations } = chairside;
const openChairside = (page: Page, email: string, ready?: string) =>
  chairside.openChairside(page, server.baseUrl, email, ready);

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
    await tapScreen(page, page.getByRole('button', { name: /^Timeline/ }));
    const row = page.getByTestId('timeline').getByRole('listitem').filter({ hasText: 'Taper check' });
    await tapScreen(page, row.getByRole('button', { name: 'Withdraw' }));
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
    // Set up at 20.5 mm: the taper ruler marks CWL − 1 = 19.5.
    await expect(
      d.step().getByTestId('ruler').locator('button[data-mm="19.5"]').getAttribute('aria-label'),
    ).resolves.toBe('19.5 millimetres, the CWL less 1 mm');
    await tapScreen(page, page.getByRole('button', { name: 'Correct the CWL (20.5 mm)' }));
    await tapScreen(page, page.getByRole('button', { name: 'apex locator' }));
    await tapScreen(page, page.getByTestId('cwl-ruler').locator('button[data-mm="21.5"]'));
    await page.getByRole('button', { name: 'Correct the CWL (21.5 mm)' }).waitFor();
    await d.card('taper');
    await expect(
      d.step().getByTestId('ruler').locator('button[data-mm="20.5"]').getAttribute('aria-label'),
    ).resolves.toBe('20.5 millimetres, the CWL less 1 mm');
    await tapScreen(page, page.getByRole('button', { name: /^Timeline/ }));
    await expect(page.getByTestId('timeline').textContent()).resolves.toContain('CWL corrected to 21.5');
    expect(await undersized(page)).toEqual([]);
    expect(await seriousViolations(page)).toEqual([]);
    await context.close();
  });

  it('shows an answer the server refused, with its reason, until the student dismisses it', async () => {
    const startedAt = new Date().toISOString();
    const { context, page } = await newSession(1024, 768);
    // The tablet does not hear of the sign-off below (its pulls of the case find nothing new),
    // so it takes the next answer and the server is the one to refuse it. Left to chance, a
    // pull could lock the case first, and the answer would never be tapped.
    await page.route(/\/api\/cases\/[^/?]+(\?.*)?$/, (route) => route.fulfill({ status: 304 }));
    await setUpDistal36(page);
    const d = new Driver(page);
    await d.answer('seat', 'Seats and holds');
    // Wait until the server holds the seat check itself (the badge may still say "synced" from the set-up).
    const seatStored = knexFactory(sqliteOptions(server.dbFile));
    try {
      const deadline = Date.now() + 30_000;
      for (;;) {
        const n = await seatStored('events')
          .join('users', 'users.id', 'events.user_id')
          .where('users.email', DEMO.priya)
          .where('events.type', 'seat.checked')
          .where('events.received_at', '>=', startedAt)
          .count<{ n: number }[]>({ n: '*' });
        if (Number(n[0]?.n ?? 0) > 0) break;
        if (Date.now() > deadline) throw new Error('the seat check never reached the server');
        await new Promise((r) => setTimeout(r, 200));
      }
    } finally {
      await seatStored.destroy();
    }
    // The next answer is tapped offline, so no pull can tell the tablet of the sign-off first.
    await context.setOffline(true);
    await d.ruler('taper', 19.5);
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
    await context.setOffline(false);
    await tapScreen(page, page.getByRole('button', { name: 'Sync now' }));
    const refused = page.getByTestId('rejected');
    await refused.waitFor({ timeout: 30_000 });
    await expect(refused.textContent()).resolves.toContain('signed off');
    await expect(refused.textContent()).resolves.toContain('Taper check');
    expect(await undersized(page)).toEqual([]);
    expect(await seriousViolations(page)).toEqual([]);
    const items = await refused.getByRole('listitem').allTextContents();
    expect(items, items.join(' / ')).toHaveLength(1);
    await tapScreen(page, refused.getByRole('button', { name: 'Dismiss' }));
    await refused.waitFor({ state: 'detached' });
    await context.close();
  });

  it("opens a patient's tooth by chart number, the only typed entry", async () => {
    const { context, page } = await newSession(768, 1024);
    await tapScreen(page, page.getByTestId('new-case'));
    await tapScreen(page, page.getByRole('button', { name: 'Patient' }));
    await tapScreen(page, page.getByTestId('quadrant-2'));
    await tapScreen(page, page.getByTestId('tooth-21'));
    await page.getByRole('textbox', { name: 'Chart number' }).fill('  TST-5521 ');
    await tapScreen(page, page.getByRole('button', { name: 'Open case' }));
    await tapScreen(page, page.getByTestId('canals-confirm'));
    await tapScreen(page, page.getByTestId('ruler-cwl').locator('button[data-mm="22.5"]'));
    await tapScreen(page, page.getByTestId('maf-50'));
    await tapScreen(page, page.getByTestId('save-canal'));
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
});
