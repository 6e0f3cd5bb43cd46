// The case around the canals on the tablet: finishing compaction as a recorded step, a CWL
// correction that asks why, submitting with an unfilled canal, and a case opened by mistake.
// Invented scenario: an extracted lower left first molar (36), CWL 20.5 mm, MAF 35.
import { mkdirSync } from 'node:fs';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import knexFactory from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import { launchBrowser } from '../helpers/browser';
import * as chairside from '../helpers/chairside';
import { DEMO } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';
import { tapScreen } from '../helpers/chairside';

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

const { Driver, setUpDistal36, seriousViolations } = chairside;

async function newSession(email: string): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
  const page = await context.newPage();
  await chairside.openChairside(page, server.baseUrl, email);
  return { context, page };
}

/** The newest case of a student on the server, with the types of its events. */
async function newestCase(email: string): Promise<{ id: string; discardedAt: string | null; types: string[] }> {
  const k = knexFactory(sqliteOptions(server.dbFile));
  try {
    const row = (await k('cases')
      .join('users', 'users.id', 'cases.student_id')
      .where('users.email', email)
      .orderBy('cases.opened_at', 'desc')
      .first('cases.id', 'cases.discarded_at')) as { id: string; discarded_at: string | null };
    const types = (await k('events').where({ case_id: row.id }).orderBy('at').pluck('type')) as string[];
    return { id: row.id, discardedAt: row.discarded_at, types };
  } finally {
    await k.destroy();
  }
}

const synced = (page: Page) =>
  page.locator('[data-testid="sync-state"][data-state="synced"]').waitFor({ timeout: 30_000 });

/** From the seat card to the spreader card, with the tablet's default answers. */
async function upToCompaction(d: InstanceType<typeof Driver>): Promise<void> {
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
}

describe('the case around the canals on the tablet', () => {
  it('records finishing compaction as a step the server judges, and "Back to compaction" withdraws it', async () => {
    const { context, page } = await newSession(DEMO.priya);
    await setUpDistal36(page);
    const d = new Driver(page);
    await upToCompaction(d);
    // One cycle at 18.5 mm, past the end of the coronal third (9.0 + 11.5 / 3 ≈ 12.8 mm).
    await d.ruler('spreader', 18.5);
    await d.answer('accessory', 'Reached');
    await d.answer('spreader', 'Finish compaction');
    await d.card('fill');
    await synced(page);
    let c = await newestCase(DEMO.priya);
    expect(c.types).toContain('compaction.finished');
    // Finished with the spreader still in the middle third: judged at the finish, not only at sear-off.
    const k = knexFactory(sqliteOptions(server.dbFile));
    try {
      const codes = (await k('findings').where({ case_id: c.id }).pluck('code')) as string[];
      expect(codes).toContain('compaction-incomplete');
    } finally {
      await k.destroy();
    }
    await d.answer('fill', 'Back to compaction');
    await d.card('spreader');
    await synced(page);
    c = await newestCase(DEMO.priya);
    expect(c.types.filter((t) => t === 'event.voided')).toHaveLength(1);
    await context.close();
  });

  it('asks why before it takes a new CWL, and the reason shows in the timeline', async () => {
    const { context, page } = await newSession(DEMO.priya);
    await setUpDistal36(page);
    await tapScreen(page, page.getByRole('button', { name: 'Correct the CWL (20.5 mm)' }));
    await page.getByTestId('cwl-reason-needed').waitFor();
    await expect(page.getByTestId('cwl-ruler').count()).resolves.toBe(0);
    await tapScreen(page, page.getByRole('button', { name: 'other' }));
    await page.getByRole('textbox', { name: 'Say why' }).fill('New radiograph after the file slipped');
    await tapScreen(page, page.getByTestId('cwl-ruler').locator('button[data-mm="21"]'));
    await page.getByRole('button', { name: 'Correct the CWL (21.0 mm)' }).waitFor();
    await chairside.armed(page);
    await tapScreen(page, page.getByRole('button', { name: /^Timeline/ }));
    await expect(page.getByTestId('timeline').textContent()).resolves.toContain(
      'CWL corrected to 21.0 mm: New radiograph after the file slipped',
    );
    expect(await seriousViolations(page)).toEqual([]);
    await context.close();
  });

  it('asks before submitting a case whose canal is unfilled, and submits only when told to', async () => {
    const { context, page } = await newSession(DEMO.priya);
    await setUpDistal36(page);
    await tapScreen(page, page.getByRole('button', { name: 'Finish tooth' }));
    await tapScreen(page, page.getByRole('button', { name: 'Restored', exact: true }));
    // Saved first: the finishing screen changes once it is, and ignores taps for a moment then.
    await page.getByText('✓ Access restored').waitFor();
    await tapScreen(page, page.getByRole('button', { name: 'Taken', exact: true }));
    await page.getByText('✓ Post-operative radiograph taken').waitFor();
    await tapScreen(page, page.getByRole('button', { name: 'Submit for review' }));
    const warnings = page.getByTestId('submit-warnings');
    await expect(warnings.textContent()).resolves.toContain('D canal is unfilled');
    await tapScreen(page, page.getByRole('button', { name: 'Not yet' }));
    await expect(page.getByTestId('submitted').count()).resolves.toBe(0);
    await tapScreen(page, page.getByRole('button', { name: 'Submit for review' }));
    await tapScreen(page, page.getByRole('button', { name: 'Submit anyway' }));
    await page.getByTestId('submitted').waitFor();
    expect(await seriousViolations(page)).toEqual([]);
    // While it waits for review the canal takes no steps; withdrawing the submission reopens it.
    await tapScreen(page, page.getByTestId('tab-D'));
    await page.getByText('Waiting for review').waitFor();
    await expect(page.locator('[data-testid="step"]').count()).resolves.toBe(0);
    await tapScreen(page, page.getByRole('button', { name: 'Withdraw the submission' }));
    await page.locator('[data-testid="step"][data-card="seat"]').waitFor();
    await synced(page);
    const c = await newestCase(DEMO.priya);
    expect(c.types.filter((t) => t === 'event.voided')).toHaveLength(1);
    await context.close();
  });

  it('keeps the other picked canals when one set-up is cancelled, and leaves no empty case behind', async () => {
    const { context, page } = await newSession(DEMO.tomas);
    await tapScreen(page, page.getByTestId('new-case'));
    await tapScreen(page, page.getByRole('button', { name: 'Extracted tooth' }));
    await tapScreen(page, page.getByTestId('quadrant-3'));
    await tapScreen(page, page.getByTestId('tooth-36'));
    await tapScreen(page, page.getByTestId('canals-confirm'));
    // The set-up card loads on first use: wait for it rather than read the title at once.
    await page.locator('#step-title', { hasText: 'Set up the MB canal' }).waitFor();
    await tapScreen(page, page.getByRole('button', { name: 'Cancel', exact: true }));
    await page.getByText('Set up the ML canal').waitFor();
    await tapScreen(page, page.getByRole('button', { name: 'Cancel', exact: true }));
    await page.getByText('Set up the D canal').waitFor();
    await tapScreen(page, page.getByRole('button', { name: 'Cancel', exact: true }));
    // No canal left: the case is discarded and the list shows no case on this tablet.
    await page.getByTestId('new-case').waitFor();
    await expect(page.getByRole('heading', { name: 'On this tablet' }).count()).resolves.toBe(0);
    await expect(page.getByTestId('saved-text').textContent()).resolves.toContain('case discarded');
    // "All synced" may still be the badge from before the discard reached the outbox: ask the server.
    await expect.poll(async () => (await newestCase(DEMO.tomas)).discardedAt, { timeout: 30_000 }).not.toBeNull();
    // Undo brings it back, on the tablet and on the server.
    await tapScreen(page, page.getByTestId('undo'));
    await page.getByRole('heading', { name: 'On this tablet' }).waitFor();
    await expect.poll(async () => (await newestCase(DEMO.tomas)).discardedAt, { timeout: 30_000 }).toBeNull();
    await context.close();
  });

  it('discards a case opened by mistake from its canal list, with a reason', async () => {
    const { context, page } = await newSession(DEMO.tomas);
    await setUpDistal36(page);
    await tapScreen(page, page.getByRole('button', { name: '+ Canal' }));
    await tapScreen(page, page.getByRole('button', { name: 'Discard this case…' }));
    await tapScreen(page, page.getByRole('button', { name: 'Wrong tooth' }));
    await page.getByTestId('new-case').waitFor();
    await expect.poll(async () => (await newestCase(DEMO.tomas)).discardedAt, { timeout: 30_000 }).not.toBeNull();
    const c = await newestCase(DEMO.tomas);
    expect(c.types).toContain('case.discarded');
    await context.close();
  });
});
