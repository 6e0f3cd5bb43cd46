// The chairside offers a reload when a new version of the app is ready, and takes it.
import { appendFileSync, cpSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser } from '../helpers/browser';
import { ROOT } from '../helpers/paths';
import { startServer, type TestServer } from '../helpers/server';

// A copy of the build inside the project (so its server finds node_modules), whose service
// worker the test changes as a new release would.
const BUILD = join(ROOT, `dist-swtest-${process.pid}`);
let server: TestServer;
let browser: Browser;

beforeAll(async () => {
  cpSync(join(ROOT, 'dist'), BUILD, { recursive: true });
  [server, browser] = await Promise.all([startServer({ outDir: BUILD }), launchBrowser()]);
});
afterAll(async () => {
  await browser?.close();
  await server?.stop();
  rmSync(BUILD, { recursive: true, force: true });
});

describe('a new version of the chairside', () => {
  it('is announced with a Reload button, which switches the page to it', async () => {
    const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
    const page = await context.newPage();
    await page.goto(`${server.baseUrl}/chairside`);
    await page.evaluate(async () => {
      await navigator.serviceWorker.ready;
    });
    await page.reload();
    expect(await page.evaluate(() => navigator.serviceWorker.controller !== null)).toBe(true);
    const prompt = page.getByRole('status').filter({ hasText: 'A new version of Coneline is ready.' });
    await expect(prompt.count()).resolves.toBe(0);

    // A new release: the worker script changes on the server.
    appendFileSync(join(BUILD, 'client/sw.js'), '\n// release 2\n');
    await page.evaluate(async () => {
      await (await navigator.serviceWorker.getRegistration())?.update();
    });
    await prompt.waitFor({ timeout: 20_000 });

    await Promise.all([page.waitForEvent('load'), prompt.getByRole('button', { name: 'Reload' }).click()]);
    await page.getByTestId('safety-line').waitFor();
    await expect(
      page.getByRole('status').filter({ hasText: 'A new version of Coneline is ready.' }).count(),
    ).resolves.toBe(0);
    const waiting = await page.evaluate(async () => (await navigator.serviceWorker.getRegistration())?.waiting ?? null);
    expect(waiting).toBeNull();
    await context.close();
  });
});
