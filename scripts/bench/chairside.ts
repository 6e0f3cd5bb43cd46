/**
 * Chairside benchmark: 200 taps recorded in headless Chromium against the built server.
 * Each tap is timed in the page from the click to the moment the island shows it saved (the
 * event is in IndexedDB with strict durability and the undo strip says "Saved"). Also weighs
 * the JavaScript, gzipped, two ways (docs/architecture.md, "Chairside budget"):
 *   chairside.js_gzip_kb      what first paint and the first open card load (the budget);
 *   chairside.js_all_gzip_kb  every chunk the page may load: the scripts it loaded plus all
 *                             they import, statically or by dynamic import(), all precached.
 *   npm run bench chairside   (or: tsx scripts/bench/chairside.ts; needs `npm run build` first)
 * Each tap waits until its card takes taps (the double-tap window, TAP_GUARD_MS), which adds
 * about 400 ms per tap to the run but nothing to the timed figure.
 * Targets: chairside.tap_to_saved_ms.p95 ≤ 50, chairside.js_gzip_kb ≤ 100.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { chromium, type Locator, type Page } from 'playwright-core';
import { prepareDb } from '../lib/dbtasks.ts';
import { startServer } from '../lib/server-process.ts';
import { DEMO } from '../lib/api-client.ts';
import { CHROMIUM_ARGS, CHROMIUM_PATH } from '../lib/chromium.ts';

const TAPS = 200;

/** Click in the page and resolve with the ms until the undo strip's save counter moves. */
function timedTap(page: Page, selector: string): Promise<number> {
  return page.evaluate(
    (sel) =>
      new Promise<number>((resolve, reject) => {
        const strip = document.querySelector<HTMLElement>('[data-testid="undo-strip"]');
        const target = document.querySelector<HTMLElement>(sel);
        if (!strip || !target) {
          reject(new Error(`missing ${sel}`));
          return;
        }
        const before = strip.dataset.saved;
        const obs = new MutationObserver(() => {
          if (strip.dataset.saved !== before) {
            obs.disconnect();
            resolve(performance.now() - t0);
          }
        });
        obs.observe(strip, { attributes: true, attributeFilter: ['data-saved'] });
        const t0 = performance.now();
        target.click();
      }),
    selector,
  );
}

// A card takes taps once its double-tap window has passed (src/lib/client/tapGuard.ts): wait it
// out, as a student reading the card does, so every timed tap counts.
const card = (page: Page, kind: string) =>
  page.locator(`[data-testid="step"][data-card="${kind}"][data-armed="true"]`).waitFor();
const answer = async (page: Page, kind: string, name: string) => {
  await card(page, kind);
  await page.getByTestId('step').getByRole('button', { name, exact: true }).click();
};
const ruler = async (page: Page, kind: string, testId = 'ruler') => {
  await card(page, kind);
  await page.getByTestId('step').getByTestId(testId).locator('button[data-mark]').click();
};

/** The workbox runtime file(s) sw.js imports. */
async function swImports(page: Page): Promise<string[]> {
  const text = await page.evaluate(async () => (await fetch('/sw.js')).text());
  return [...new Set([...text.matchAll(/["']\.\/(workbox-[\w-]+?)(?:\.js)?["']/g)].map((m) => `/${m[1]}.js`))];
}

/** Paths the service worker precaches, from the manifest inlined in sw.js. */
async function precached(baseUrl: string): Promise<Set<string>> {
  const text = await (await fetch(`${baseUrl}/sw.js`)).text();
  return new Set([...text.matchAll(/url:\s*["']([^"']+)["']/g)].map((m) => new URL(m[1]!, `${baseUrl}/`).pathname));
}

/**
 * Every same-origin script reachable from `entries` by static import (and, with `dynamic`,
 * by import() too), with its gzipped size. Reads the built files as the browser gets them.
 */
async function reachableScripts(baseUrl: string, entries: string[], dynamic: boolean): Promise<Map<string, number>> {
  const sizes = new Map<string, number>();
  const queue = [...entries];
  while (queue.length > 0) {
    const url = queue.shift()!;
    if (sizes.has(url)) continue;
    const body = Buffer.from(await (await fetch(url)).arrayBuffer());
    sizes.set(url, gzipSync(body).length);
    const text = body.toString('utf8');
    const pattern = dynamic
      ? /(?:\bfrom\s*|\bimport\s*\(?\s*)["']([^"']+\.js)["']/g
      : /(?:\bfrom\s*|\bimport\s*)["']([^"']+\.js)["']/g;
    for (const m of text.matchAll(pattern)) {
      const next = new URL(m[1]!, url);
      if (next.origin === new URL(baseUrl).origin && !sizes.has(next.href)) queue.push(next.href);
    }
  }
  return sizes;
}

const kbOf = (sizes: Iterable<number>) => [...sizes].reduce((a, b) => a + b, 0) / 1024;

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)] ?? NaN;
}

const dir = mkdtempSync(join(tmpdir(), 'coneline-bench-'));
const template = join(dir, 'template.sqlite');
await prepareDb(template, { seed: true });
const server = await startServer({ templateDb: template });
const browser = await chromium.launch({
  executablePath: CHROMIUM_PATH,
  args: CHROMIUM_ARGS,
  headless: true,
});
try {
  const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
  const page = await context.newPage();
  await page.goto(`${server.baseUrl}/signin?callbackUrl=%2Fchairside`);
  await page.getByLabel('E-mail').fill(DEMO.priya);
  await page.getByLabel('Password').fill(DEMO.password);
  await Promise.all([
    page.waitForURL((u) => u.pathname === '/chairside'),
    page.getByRole('button', { name: 'Sign in' }).click(),
  ]);

  // Every script the chairside page loads, from a fresh load.
  const scripts = new Map<string, number>();
  page.on('response', async (res) => {
    if (res.request().resourceType() !== 'script' || !res.ok()) return;
    try {
      scripts.set(res.url(), gzipSync(await res.body()).length);
    } catch {
      /* body gone */
    }
  });
  await page.reload({ waitUntil: 'networkidle' });
  // Screens ignore taps for a moment after they change (TAP_GUARD_MS): wait it out, untimed.
  const settledTap = async (target: Locator) => {
    await target.waitFor();
    await page.waitForFunction(() => !document.querySelector('[data-testid="screen"][data-armed="false"]'));
    await target.click();
  };
  await settledTap(page.getByTestId('new-case'));

  // A training block, one canal, up to the seated master cone.
  await settledTap(page.getByRole('button', { name: 'Training block' }));
  await settledTap(page.getByTestId('canals-confirm'));
  await settledTap(page.getByTestId('ruler-cwl').locator('button[data-mark]'));
  await settledTap(page.getByTestId('maf-30'));
  await settledTap(page.getByTestId('save-canal'));
  await answer(page, 'seat', 'Seats and holds');
  await ruler(page, 'taper');
  await answer(page, 'rinse', 'Done');
  await ruler(page, 'dry');
  await ruler(page, 'master', 'ruler-master');
  await answer(page, 'master', 'Reached');
  await answer(page, 'seal', 'Seated');

  // 100 compaction cycles: a spreader depth on the ruler, then "Reached".
  const times: number[] = [];
  for (let i = 0; i < TAPS / 2; i++) {
    await card(page, 'spreader');
    times.push(await timedTap(page, '[data-testid="step"] [data-testid="ruler"] button[data-mark]'));
    await card(page, 'accessory');
    times.push(await timedTap(page, '[data-testid="step"] [data-testid="reached"]'));
  }
  const sorted = [...times].sort((a, b) => a - b);
  // The page's own scripts (in its HTML) and what they import statically load before the
  // island can paint and show a card; import() chunks load later, from the precache.
  const html = await (await fetch(`${server.baseUrl}/chairside`)).text();
  const entries = [...scripts.keys()].filter((u) => html.includes(new URL(u).pathname));
  const firstPaint = await reachableScripts(server.baseUrl, entries, false);
  const kb = kbOf(firstPaint.values());
  const all = await reachableScripts(server.baseUrl, [...scripts.keys()], true);
  const inPrecache = await precached(server.baseUrl);
  const notPrecached = [...all.keys()].filter((u) => !inPrecache.has(new URL(u).pathname));
  const worker = await Promise.all(
    ['/sw.js', ...(await swImports(page))].map(
      async (p) => gzipSync(Buffer.from(await (await fetch(server.baseUrl + p)).arrayBuffer())).length,
    ),
  );
  for (const [url, size] of all) {
    const when = firstPaint.has(url) ? 'first paint' : scripts.has(url) ? 'loaded later' : 'may load';
    console.log(`script ${new URL(url).pathname}: ${(size / 1024).toFixed(1)} KB gzip (${when})`);
  }
  for (const u of notPrecached) console.log(`not precached: ${new URL(u).pathname}`);
  console.log(
    `service worker (its own context, not counted below): ${(worker.reduce((a, b) => a + b, 0) / 1024).toFixed(1)} KB gzip`,
  );
  console.log(`chairside.tap_to_saved_ms.p50: ${percentile(sorted, 50).toFixed(1)}`);
  console.log(`chairside.tap_to_saved_ms.p95: ${percentile(sorted, 95).toFixed(1)}`);
  console.log(`chairside.js_gzip_kb: ${kb.toFixed(1)}`);
  console.log(`chairside.js_all_gzip_kb: ${kbOf(all.values()).toFixed(1)}`);
  await context.close();
} finally {
  await browser.close();
  await server.stop();
  rmSync(dir, { recursive: true, force: true });
}
