// Gloved double taps on the chairside cards, as real mouse clicks in Chromium: two taps
// 180 ms apart (the second lands on the next card) and an instant double tap (both land on
// the same answer before the card can change). Each is one answer.
import { mkdirSync } from 'node:fs';
import type { Browser, BrowserContext, Locator, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TAP_GUARD_MS } from '../../src/lib/client/tapGuard';
import { launchBrowser } from '../helpers/browser';
import { DEMO } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';
import * as chairside from '../helpers/chairside';

// Invented scenario: an extracted lower left first molar (36), distal canal, CWL 20.5 mm, MAF 35.
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

const { Driver, readRecordedTypes, setUpDistal36 } = chairside;

async function newSession(
  width = 1024,
  height = 768,
): Promise<{ context: BrowserContext; page: Page; d: InstanceType<typeof Driver> }> {
  const context = await browser.newContext({ viewport: { width, height } });
  const page = await context.newPage();
  await chairside.openChairside(page, server.baseUrl, DEMO.priya);
  await setUpDistal36(page);
  return { context, page, d: new Driver(page) };
}

/**
 * Two taps on the middle of `target`, `gapMs` apart, where it was when the first landed.
 * On a loaded machine the second can reach the page much later than asked: then it is not a
 * double tap, and the test says so (and is retried) rather than judging the guard by it.
 */
async function doubleTap(page: Page, target: Locator, gapMs: number): Promise<void> {
  const box = (await target.boundingBox())!;
  const x = box.x + box.width / 2;
  const y = box.y + box.height / 2;
  await page.evaluate(() => {
    const w = window as unknown as { tapTimes: number[] };
    w.tapTimes = [];
    window.addEventListener('pointerdown', (e) => w.tapTimes.push(e.timeStamp), { capture: true });
  });
  await page.mouse.click(x, y);
  await page.waitForTimeout(gapMs);
  await page.mouse.click(x, y);
  const times = await page.evaluate(() => (window as unknown as { tapTimes: number[] }).tapTimes);
  expect(times.length, 'both taps reached the page').toBeGreaterThanOrEqual(2);
  expect(times[1]! - times[0]!, 'the machine kept the two taps within the double-tap window').toBeLessThan(
    TAP_GUARD_MS,
  );
}

/** How many events of each type the tablet holds, once a stray second answer would have been saved. */
async function counts(page: Page): Promise<Record<string, number>> {
  await page.waitForTimeout(TAP_GUARD_MS + 200);
  const out: Record<string, number> = {};
  for (const t of await page.evaluate(readRecordedTypes)) out[t] = (out[t] ?? 0) + 1;
  return out;
}

describe('a gloved double tap on a chairside card', { retry: 2 }, () => {
  it('records one seat check and nothing on the next card from two taps 180 ms apart', async () => {
    const { context, page, d } = await newSession();
    await d.card('seat');
    await doubleTap(page, d.step().getByRole('button', { name: 'Seats and holds' }), 180);
    const n = await counts(page);
    expect(n['seat.checked']).toBe(1);
    expect(n['taper.checked']).toBeUndefined();
    await d.card('taper');
    await expect(page.getByTestId('findings').count()).resolves.toBe(0);
    await context.close();
  });

  it('records one seat check from an instant double tap', async () => {
    const { context, page, d } = await newSession();
    await d.card('seat');
    await d.step().getByRole('button', { name: 'Seats and holds' }).dblclick();
    await d.card('taper');
    expect((await counts(page))['seat.checked']).toBe(1);
    await context.close();
  });

  it('records one taper check from an instant double tap on a ruler button', async () => {
    const { context, page, d } = await newSession();
    await d.answer('seat', 'Seats and holds');
    await d.card('taper');
    await d.step().getByTestId('ruler').locator('button[data-mm="19.5"]').dblclick();
    await d.card('radiograph');
    const n = await counts(page);
    expect(n['taper.checked']).toBe(1);
    expect(n['radiograph.taken']).toBeUndefined();
    await context.close();
  });

  it("records one spreader depth from two taps 180 ms apart on its ruler, and leaves the cone card's choices alone", async () => {
    const { context, page, d } = await newSession();
    await d.answer('seat', 'Seats and holds');
    await d.ruler('taper', 19.5);
    await d.answer('radiograph', 'Taken');
    await d.answer('rinse', 'Done');
    await d.ruler('dry', 20.5);
    await d.ruler('master', 20.5, 'ruler-master');
    await d.answer('master', 'Reached');
    await d.answer('radiograph', 'Taken');
    await d.answer('seal', 'Seated');
    await d.card('spreader');
    // Every button of the cone card that could lie under the spreader's ruler.
    await doubleTap(page, d.step().getByTestId('ruler').locator('button[data-mm="18.5"]'), 180);
    await d.card('accessory');
    const n = await counts(page);
    expect(n['spreader.placed']).toBe(1);
    expect(n['accessory.placed']).toBeUndefined();
    const pressed = await d
      .step()
      .locator('button[aria-pressed="true"]')
      .evaluateAll((els) => els.map((e) => e.getAttribute('data-mm') ?? e.getAttribute('aria-label')));
    // A fresh cone card: the set-up's accessory size and the spreader depth, nothing else.
    expect(pressed).toEqual(['size MF', '18.5']);
    await context.close();
  });
});

describe('a gloved double tap on the screens around the cards', { retry: 2 }, () => {
  async function freshTablet(): Promise<{ context: BrowserContext; page: Page }> {
    const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
    const page = await context.newPage();
    await chairside.openChairside(page, server.baseUrl, DEMO.priya);
    return { context, page };
  }

  it('picks a quadrant from two taps 180 ms apart and opens no case with the second', async () => {
    const { context, page } = await freshTablet();
    await chairside.tapScreen(page, page.getByTestId('new-case'));
    await chairside.tapScreen(page, page.getByRole('button', { name: 'Extracted tooth' }));
    await page.getByTestId('quadrant-3').waitFor();
    await chairside.settled(page);
    // Where "quadrant 3" was, the tooth grid's buttons appear: the second tap must not pick one.
    await doubleTap(page, page.getByTestId('quadrant-3'), 180);
    const n = await counts(page);
    expect(n['case.opened']).toBeUndefined();
    await expect(page.getByRole('heading', { name: 'Which tooth?' }).isVisible()).resolves.toBe(true);
    await context.close();
  });

  it('opens one case from an instant double tap on a tooth', async () => {
    const { context, page } = await freshTablet();
    await chairside.tapScreen(page, page.getByTestId('new-case'));
    await chairside.tapScreen(page, page.getByRole('button', { name: 'Extracted tooth' }));
    await chairside.tapScreen(page, page.getByTestId('quadrant-3'));
    await page.getByTestId('tooth-36').waitFor();
    await chairside.settled(page);
    await page.getByTestId('tooth-36').dblclick();
    await page.getByTestId('canals-confirm').waitFor();
    expect((await counts(page))['case.opened']).toBe(1);
    await context.close();
  });

  it('saves one canal from an instant double tap on "Save"', async () => {
    const { context, page } = await freshTablet();
    const tap = (target: Locator) => chairside.tapScreen(page, target);
    await tap(page.getByTestId('new-case'));
    await tap(page.getByRole('button', { name: 'Training block' }));
    await tap(page.getByTestId('canals-confirm'));
    await tap(page.getByTestId('ruler-cwl').locator('button[data-mm="19"]'));
    await tap(page.getByTestId('maf-30'));
    await page.getByTestId('save-canal').waitFor();
    await chairside.settled(page);
    await page.getByTestId('save-canal').dblclick();
    await page.locator('[data-testid="step"][data-card="seat"]').waitFor();
    expect((await counts(page))['canal.added']).toBe(1);
    await context.close();
  });

  it('asks before submitting a case with an unfilled canal, and a second tap 180 ms later does not answer it', async () => {
    const { context, page } = await newSession();
    await chairside.tapScreen(page, page.getByRole('button', { name: 'Finish tooth' }));
    const submit = page.getByRole('button', { name: 'Submit for review' });
    await submit.waitFor();
    await submit.evaluate((el) => el.scrollIntoView({ block: 'center' }));
    await chairside.settled(page);
    // "Submit anyway" takes the place of "Submit for review" under the finger.
    await doubleTap(page, submit, 180);
    const n = await counts(page);
    expect(n['case.submitted']).toBeUndefined();
    await expect(page.getByRole('button', { name: 'Submit anyway' }).isVisible()).resolves.toBe(true);
    await context.close();
  });
});
