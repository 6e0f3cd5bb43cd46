// The first load of /chairside: the static shell is in the served HTML and paints before the
// island's script arrives; the island then takes its place without moving anything
// (cumulative layout shift below 0.02, measured by the browser's layout-shift entries).
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SAFETY_LINE } from '../../src/lib/rules/core';
import { launchBrowser, signIn } from '../helpers/browser';
import { anonymous, DEMO } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';
import { seriousViolations } from '../helpers/chairside';

let server: TestServer;
let browser: Browser;
beforeAll(async () => {
  [server, browser] = await Promise.all([startServer(), launchBrowser()]);
});
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

const ISLAND_DELAY_MS = 1500;

interface Shift {
  value: number;
  at: number;
  nodes: string[];
}

/** Records every layout shift not caused by input, from the start of the page's life. */
function watchShifts(): void {
  const w = window as unknown as { shifts: Shift[] };
  w.shifts = [];
  new PerformanceObserver((list) => {
    for (const e of list.getEntries() as (PerformanceEntry & {
      value: number;
      hadRecentInput: boolean;
      sources?: { node?: Node | null }[];
    })[]) {
      if (e.hadRecentInput) continue;
      w.shifts.push({
        value: e.value,
        at: e.startTime,
        nodes: (e.sources ?? []).map((s) =>
          s.node instanceof Element ? s.node.outerHTML.slice(0, 80) : String(s.node),
        ),
      });
    }
  }).observe({ type: 'layout-shift', buffered: true });
}

/** Cumulative layout shift as browsers report it: the worst session window (gaps under 1 s, at most 5 s). */
function cls(shifts: Shift[]): number {
  let worst = 0;
  let sum = 0;
  let start = -Infinity;
  let last = -Infinity;
  for (const s of shifts) {
    if (s.at - last > 1000 || s.at - start > 5000) {
      sum = 0;
      start = s.at;
    }
    sum += s.value;
    last = s.at;
    worst = Math.max(worst, sum);
  }
  return worst;
}

/** Opens /chairside with the island's script held back, so what paints before it can be seen. */
async function openSlowly(page: Page, ready: string): Promise<void> {
  await page.route(/\/_astro\/ChairsideApp\.[\w-]+\.js$/, async (route) => {
    await new Promise((r) => setTimeout(r, ISLAND_DELAY_MS));
    await route.continue();
  });
  await page.goto(`${server.baseUrl}/chairside`, { waitUntil: 'commit' });
  // The shell, on screen while the island's script is still on its way.
  await page.getByRole('heading', { name: 'Loading your cases…' }).waitFor({ state: 'visible' });
  await expect(page.getByTestId(ready).count()).resolves.toBe(0);
  await page.getByTestId(ready).waitFor();
  // Late arrivals (the sync state, the storage note, cases from the server) have their say.
  await page.waitForTimeout(1500);
}

async function timings(page: Page): Promise<{ fcp: number; island: number; shifts: Shift[] }> {
  return page.evaluate(() => {
    const island = performance.getEntriesByType('resource').find((r) => /\/_astro\/ChairsideApp\./.test(r.name)) as
      PerformanceResourceTiming | undefined;
    return {
      fcp: performance.getEntriesByName('first-contentful-paint')[0]?.startTime ?? Infinity,
      island: island?.responseEnd ?? 0,
      shifts: (window as unknown as { shifts: Shift[] }).shifts,
    };
  });
}

describe('the first load of /chairside', () => {
  it('is served with the shell’s words in its HTML and no one’s data', async () => {
    const res = await anonymous(server.baseUrl).fetch('/chairside');
    expect(res.status).toBe(200);
    const html = (await res.text()).replace(/&#39;|&#x27;/g, "'");
    expect(html).toContain('Loading your cases…');
    expect(html).toContain(SAFETY_LINE);
    expect(html).toContain('aria-label="Coneline"');
    for (const name of ['Priya', 'Mira', 'Tomas', '@']) expect(html).not.toContain(name);
  });

  it.each([
    [768, 1024],
    [1024, 768],
  ])(
    'paints the shell before the island’s script and moves nothing when a signed-in student’s cases appear, at %i × %i',
    async (width, height) => {
      const context = await browser.newContext({ viewport: { width, height } });
      await context.addInitScript(watchShifts);
      const page = await context.newPage();
      await signIn(page, server.baseUrl, DEMO.priya, DEMO.password, '/');
      await openSlowly(page, 'new-case');
      const t = await timings(page);
      expect(t.fcp).toBeLessThan(t.island);
      expect(cls(t.shifts), JSON.stringify(t.shifts)).toBeLessThan(0.02);
      expect(await seriousViolations(page)).toEqual([]);
      await context.close();
    },
  );

  it('moves nothing when nobody is signed in either', async () => {
    const context = await browser.newContext({ viewport: { width: 768, height: 1024 } });
    await context.addInitScript(watchShifts);
    const page = await context.newPage();
    await page.route(/\/_astro\/ChairsideApp\.[\w-]+\.js$/, async (route) => {
      await new Promise((r) => setTimeout(r, ISLAND_DELAY_MS));
      await route.continue();
    });
    await page.goto(`${server.baseUrl}/chairside`, { waitUntil: 'commit' });
    await page.getByRole('heading', { name: 'Loading your cases…' }).waitFor({ state: 'visible' });
    await page.getByRole('heading', { name: /Sign in/ }).waitFor();
    await page.waitForTimeout(1000);
    const t = await timings(page);
    expect(t.fcp).toBeLessThan(t.island);
    expect(cls(t.shifts), JSON.stringify(t.shifts)).toBeLessThan(0.02);
    await context.close();
  });
});
