// What the chairside browser tests share: a tap-counting driver, opening the island, the
// invented canal they record, and checks of target sizes and accessibility.
import AxeBuilder from '@axe-core/playwright';
import type { Locator, Page } from 'playwright-core';
import { expect } from 'vitest';
import { signIn } from './browser';
import { DEMO } from './client';

/** Drives the island by taps and counts them. */
export class Driver {
  taps = 0;
  constructor(readonly page: Page) {}
  step(): Locator {
    return this.page.getByTestId('step');
  }
  async tap(l: Locator): Promise<void> {
    await l.click();
    this.taps++;
  }
  /** Waits for the card, and for taps on it to count (src/lib/client/tapGuard.ts ignores them for a moment after it changes). */
  async card(kind: string): Promise<void> {
    await this.page.locator(`[data-testid="step"][data-card="${kind}"]`).waitFor({ timeout: 20_000 });
    await armed(this.page);
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

/** Waits until the card on screen takes taps (its double-tap window has passed). */
export async function armed(page: Page): Promise<void> {
  await page.locator('[data-testid="step"][data-armed="true"]').waitFor({ timeout: 20_000 });
}

/**
 * Waits until every guarded screen takes taps (the open-case steps, the canal set-up, the
 * finishing card ignore taps for TAP_GUARD_MS after they change), then taps.
 */
export async function settled(page: Page): Promise<void> {
  await page.waitForFunction(() => !document.querySelector('[data-testid="screen"][data-armed="false"]'), null, {
    timeout: 20_000,
  });
}

/** A tap on a guarded screen, once it takes taps. */
export async function tapScreen(page: Page, target: Locator): Promise<void> {
  // The target first: a screen that loads lazily is guarded from the moment it appears.
  await target.waitFor({ timeout: 20_000 });
  await settled(page);
  await target.click();
}

export async function openChairside(page: Page, baseUrl: string, email: string, ready = 'new-case'): Promise<void> {
  await signIn(page, baseUrl, email, DEMO.password, '/chairside');
  if (new URL(page.url()).pathname !== '/chairside') await page.goto(`${baseUrl}/chairside`);
  try {
    await page.getByTestId(ready).waitFor();
  } catch (e) {
    await page.screenshot({ path: `test-results/chairside-failed-open-${email.split('.')[0]}.png` });
    throw e;
  }
}

/** Opens tooth 36 with only the distal canal and sets it up (not counted as canal taps). */
export async function setUpDistal36(page: Page): Promise<void> {
  const tap = (target: Locator) => tapScreen(page, target);
  await tap(page.getByTestId('new-case'));
  await tap(page.getByRole('button', { name: 'Extracted tooth' }));
  await tap(page.getByTestId('quadrant-3'));
  await tap(page.getByTestId('tooth-36'));
  await tap(page.getByTestId('canal-MB'));
  await tap(page.getByTestId('canal-ML'));
  await tap(page.getByTestId('canals-confirm'));
  await tap(page.getByTestId('ruler-cwl').locator('button[data-mm="20.5"]'));
  await tap(page.getByTestId('maf-35'));
  await tap(page.getByTestId('ruler-orifice').locator('button[data-mm="9"]'));
  await tap(page.getByTestId('save-canal'));
  await page.locator('[data-testid="step"][data-card="seat"][data-armed="true"]').waitFor();
}

/** A whole canal by taps, with the tablet's default answers; optionally one short cone redone. */
export async function recordCanal(d: Driver, opts: { shortCone: boolean; check?: () => Promise<void> }): Promise<void> {
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
  await d.step().getByRole('button', { name: '✓ Radiograph taken' }).waitFor();
  await d.card('fill');
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
export async function undersized(page: Page): Promise<string[]> {
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

export async function seriousViolations(page: Page): Promise<string[]> {
  const result = await new AxeBuilder({ page }).analyze();
  return result.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).join(', ')})`);
}

/** The demo banner is there, and adds no more than one slim line to the top bar. */
export async function expectSlimDemoBanner(page: Page): Promise<void> {
  const banner = page.getByRole('banner').getByTestId('demo-banner');
  await expect(banner.textContent()).resolves.toContain('Demo clinic');
  expect((await banner.boundingBox())!.height).toBeLessThanOrEqual(28);
}

export async function syncState(page: Page): Promise<string | null> {
  return page.getByTestId('sync-state').getAttribute('data-state');
}

/** In the page: ids of every queued event on this tablet, whoever recorded them. */
export function readQueuedIds(): Promise<string[]> {
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

/** In the page: the type of every event recorded on this tablet, whoever recorded it. */
export function readRecordedTypes(): Promise<string[]> {
  return new Promise((resolve, reject) => {
    const open = indexedDB.open('coneline-chairside');
    open.onerror = () => reject(open.error);
    open.onsuccess = () => {
      const req = open.result.transaction('events').objectStore('events').getAll();
      req.onsuccess = () => {
        resolve((req.result as { event: { type: string } }[]).map((r) => r.event.type));
        open.result.close();
      };
    };
  });
}
