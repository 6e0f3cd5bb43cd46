// The cone fit at the chair on the tablet (docs/review.md): the student asks for a check, the
// attending approves it, and the next pull brings the approval to the tablet; an approval at
// the chair recorded offline; a returned case marked on the case list, opened at the canal its
// return names, with what the attending said. Invented scenario, Mira's extracted 36 and 14.
import { randomUUID } from 'node:crypto';
import { mkdirSync } from 'node:fs';
import knexFactory, { type Knex } from 'knex';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import { launchBrowser } from '../helpers/browser';
import * as chairside from '../helpers/chairside';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { EventWriter } from '../helpers/events';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let browser: Browser;
let k: Knex;
let helen: ApiClient;
let mira: ApiClient;
beforeAll(async () => {
  mkdirSync('test-results', { recursive: true });
  [server, browser] = await Promise.all([startServer(), launchBrowser()]);
  k = knexFactory(sqliteOptions(server.dbFile));
  // The course asks for the attending's approval before sealing (a director's setting).
  await k('settings').insert({ key: 'requireConeFitApproval', value_json: '1' }).onConflict('key').merge();
  await k('settings_version').where({ id: 1 }).increment('version', 1);
  [helen, mira] = await Promise.all([
    apiSignIn(server.baseUrl, DEMO.helen, DEMO.password),
    apiSignIn(server.baseUrl, DEMO.mira, DEMO.password),
  ]);
});
afterAll(async () => {
  await k?.destroy();
  await browser?.close();
  await server?.stop();
});

const { Driver, setUpDistal36, undersized, seriousViolations } = chairside;

async function tablet(): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport: { width: 768, height: 1024 } });
  const page = await context.newPage();
  await chairside.openChairside(page, server.baseUrl, DEMO.mira);
  return { context, page };
}

/** Tooth 36's distal canal by taps, up to the card asking for the cone-fit radiograph. */
async function upToConeFit(page: Page): Promise<InstanceType<typeof Driver>> {
  await setUpDistal36(page);
  const d = new Driver(page);
  await d.answer('seat', 'Seats and holds');
  await d.ruler('taper', 19.5);
  await d.answer('radiograph', 'Taken');
  await d.answer('rinse', 'Done');
  await d.ruler('dry', 20.5);
  await d.ruler('master', 20.5, 'ruler-master');
  await d.answer('master', 'Reached');
  await d.card('radiograph');
  return d;
}

/** Waits until the tablet has nothing left to send. */
async function allSent(page: Page): Promise<void> {
  const deadline = Date.now() + 30_000;
  while ((await page.evaluate(chairside.readQueuedIds)).length > 0) {
    if (Date.now() > deadline) throw new Error('the tablet never sent its events');
    await page.waitForTimeout(200);
  }
}

const panel = (page: Page) => page.getByTestId('conefit-panel');
/** Waits until the cone-fit panel takes taps (it has its own double-tap window, as a card does). */
const panelArmed = (page: Page) => page.locator('[data-testid="conefit-panel"][data-armed="true"]').waitFor();

describe('the cone fit at the chair on the tablet', () => {
  it("brings the attending's approval of a requested cone-fit check with the next pull", async () => {
    const { context, page } = await tablet();
    const d = await upToConeFit(page);
    await panelArmed(page);
    await d.tap(page.getByTestId('ask-conefit'));
    await page.locator('[data-testid="conefit-panel"][data-status="waiting"]').waitFor();
    await expect(page.getByTestId('conefit-status').textContent()).resolves.toMatch(/Waiting for your attending/);
    await d.answer('radiograph', 'Taken');
    await d.card('seal');
    // The course asks for the approval and none stands: the sealing card says so first.
    await page.getByTestId('conefit-stop').waitFor();
    await expect(page.getByTestId('conefit-stop').textContent()).resolves.toMatch(
      /approve the cone fit before you seal/,
    );
    expect(await undersized(page)).toEqual([]);
    expect(await seriousViolations(page)).toEqual([]);
    await allSent(page);
    const request = (await k('events')
      .where({ type: 'conefit.requested' })
      .orderBy('received_at', 'desc')
      .first('case_id', 'canal_id')) as { case_id: string; canal_id: string };

    // The pull's timer is made the test's: the tablet opens again under a clock the test moves,
    // and its first pull of the open case is answered before the attending decides.
    await page.clock.install();
    const firstPull = page.waitForResponse((r) => r.url().endsWith(`/api/cases/${request.case_id}`));
    await page.reload();
    await firstPull;
    await page.locator('[data-testid="conefit-panel"][data-status="waiting"]').waitFor();

    const res = await helen.post(`/api/cases/${request.case_id}/signoffs`, {
      id: randomUUID(),
      checkpoint: 'cone-fit',
      canalId: request.canal_id,
      decision: 'approve',
      expectedState: 'open',
    });
    expect(res.status).toBe(201);
    // Nothing until the next pull, at most 60 s later.
    await page.waitForTimeout(500);
    await expect(panel(page).getAttribute('data-status')).resolves.toBe('waiting');
    const nextPull = page.waitForResponse(
      (r) => r.url().endsWith(`/api/cases/${request.case_id}`) && r.status() === 200,
    );
    await page.clock.fastForward(61_000);
    await nextPull;
    await page.locator('[data-testid="conefit-panel"][data-status="approved"]').waitFor();
    await expect(page.getByTestId('conefit-status').textContent()).resolves.toMatch(/^Approved by Dr Helen Vasquez/);
    await expect(page.getByTestId('conefit-stop').count()).resolves.toBe(0);
    await expect(page.getByTestId('case-news').textContent()).resolves.toContain('Cone fit, D canal: Approved');
    await page.screenshot({ path: 'test-results/chairside-conefit-approved.png' });
    expect(await seriousViolations(page)).toEqual([]);
    await context.close();
  });

  it('records an approval at the chair offline, naming one of the attendings the tablet keeps', async () => {
    const { context, page } = await tablet();
    const d = await upToConeFit(page);
    await d.answer('radiograph', 'Taken');
    await d.card('seal');
    await page.getByTestId('conefit-stop').waitFor();
    await context.setOffline(true);
    await panelArmed(page);
    await d.tap(page.getByTestId('at-chair'));
    await panelArmed(page);
    const ids = (await k('users').where({ email: DEMO.helen }).first('id')) as { id: number };
    await d.tap(page.getByTestId(`attending-${ids.id}`));
    await page.locator('[data-testid="conefit-panel"][data-status="at-chair"]').waitFor();
    await expect(page.getByTestId('conefit-status').textContent()).resolves.toMatch(
      /^Dr Helen Vasquez approved it at the chair .*not yet confirmed/,
    );
    await expect(page.getByTestId('conefit-stop').count()).resolves.toBe(0);
    expect(await undersized(page)).toEqual([]);
    await context.setOffline(false);
    await page.getByRole('button', { name: 'Sync now' }).click();
    await allSent(page);
    const stored = (await k('events').where({ type: 'conefit.approvedAtChair' }).first('data_json')) as {
      data_json: string;
    };
    expect(JSON.parse(stored.data_json)).toEqual({ attendingId: String(ids.id) });
    await context.close();
  });

  it('marks a returned case on the case list with its comment and opens it at the canal the return names', async () => {
    // Mira's upper right first premolar, set up from another device: two canals, B then L.
    const w = new EventWriter();
    w.open('extracted', 14);
    w.canal('B', 21);
    const l = w.canal('L', 21);
    const synced = await mira.post('/api/sync', { deviceId: 'workstation', events: w.events });
    expect(synced.status).toBe(200);

    const { context, page } = await tablet();
    await page.getByRole('button', { name: 'Fetch tooth 14' }).click();
    await page.getByTestId('tab-B').waitFor();
    await page.getByRole('button', { name: 'Cases' }).click();
    await page.getByRole('heading', { name: 'On this tablet' }).waitFor();

    // Submitted from the workstation; the attending returns the fill check of L, then the case.
    expect(
      (await mira.post('/api/sync', { deviceId: 'workstation', events: [w.add('case.submitted', {})] })).status,
    ).toBe(200);
    for (const body of [
      { checkpoint: 'fill-check', canalId: l, comment: 'The lingual canal was never filled: fill it.' },
      { checkpoint: 'final', comment: 'Finish the lingual canal, then submit again.' },
    ]) {
      const res = await helen.post(`/api/cases/${w.caseId}/signoffs`, {
        id: randomUUID(),
        decision: 'return',
        expectedState: 'submitted',
        ...body,
      });
      expect(res.status).toBe(201);
    }

    await page.reload();
    const row = page.getByRole('listitem').filter({ has: page.getByRole('button', { name: 'Tooth 14', exact: true }) });
    await row.getByTestId('came-back').waitFor();
    await row.getByTestId('return-comment').waitFor();
    await expect(row.getByTestId('return-comment').textContent()).resolves.toContain(
      'Finish the lingual canal, then submit again.',
    );
    expect(await undersized(page)).toEqual([]);
    expect(await seriousViolations(page)).toEqual([]);
    await page.screenshot({ path: 'test-results/chairside-came-back.png' });

    await row.getByRole('button', { name: 'Tooth 14', exact: true }).click();
    await page.getByTestId('tab-L').waitFor();
    await expect(page.getByTestId('tab-L').getAttribute('aria-current')).resolves.toBe('page');
    await expect(page.getByTestId('tab-B').getAttribute('aria-current')).resolves.toBeNull();
    // Not locked: a returned case takes steps again.
    await page.locator('[data-testid="step"][data-card="seat"]').waitFor();
    const news = page.getByTestId('case-news');
    await news.waitFor();
    await expect(news.textContent()).resolves.toContain('The lingual canal was never filled: fill it.');
    await expect(news.textContent()).resolves.toContain('Fill check, L canal: Returned');
    expect(await seriousViolations(page)).toEqual([]);
    await page.screenshot({ path: 'test-results/chairside-returned-opened.png', fullPage: true });
    await context.close();
  });
});
