// The chairside island at four tablet sizes: every control large enough for gloves, axe clean.
import { mkdirSync } from 'node:fs';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser } from '../helpers/browser';
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
      await tapScreen(page, page.getByRole('button', { name: 'Finish the tooth' }));
      await check();
      await page.screenshot({ path: `test-results/chairside-${width}x${height}-summary.png`, fullPage: true });
      expect([...new Set(problems)]).toEqual([]);
      await context.close();
    },
    120_000,
  );
});
