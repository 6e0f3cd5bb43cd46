import AxeBuilder from '@axe-core/playwright';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, signIn } from '../helpers/browser';
import { DEMO } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let browser: Browser;
beforeAll(async () => {
  [server, browser] = await Promise.all([startServer(), launchBrowser()]);
});
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function seriousViolations(page: Page): Promise<string[]> {
  const result = await new AxeBuilder({ page }).analyze();
  return result.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.id}: ${v.help}`);
}

describe('signing in in Chromium', () => {
  it('shows the demo banner on the sign-in page, one slim line that passes axe, while the demo clinic is in', async () => {
    const context = await browser.newContext({ viewport: { width: 768, height: 1024 } });
    const page = await context.newPage();
    await page.goto(`${server.baseUrl}/signin`);
    const banner = page.getByTestId('demo-banner');
    await expect(banner.textContent()).resolves.toContain('Demo clinic');
    expect((await banner.boundingBox())!.height).toBeLessThanOrEqual(28);
    expect(await seriousViolations(page)).toEqual([]);
    await context.close();
  });

  it.each([
    ['student', DEMO.mira, 'Your cases'],
    ['attending', DEMO.helen, 'Waiting for your review'],
    ['director', DEMO.ingrid, 'Accounts'],
  ])('takes the %s to their home page', async (_role, email, heading) => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, server.baseUrl, email, DEMO.password);
    expect(new URL(page.url()).pathname).toBe('/');
    await expect(page.getByRole('heading', { name: heading }).count()).resolves.toBeGreaterThan(0);
    expect(await seriousViolations(page)).toEqual([]);
    await page.screenshot({ path: `test-results/home-${_role}.png`, fullPage: true });
    await context.close();
  });

  it('says plainly when the password is wrong, and keeps the visitor on the sign-in page', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, server.baseUrl, DEMO.mira, 'wrong-password-here');
    expect(new URL(page.url()).pathname).toBe('/signin');
    await expect(page.getByRole('alert').textContent()).resolves.toContain('do not match an active account');
    expect(await seriousViolations(page)).toEqual([]);
    await context.close();
  });

  it('brings a visitor back to the page they asked for after signing in', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await page.goto(`${server.baseUrl}/admin`);
    expect(new URL(page.url()).pathname).toBe('/signin');
    await page.getByLabel('E-mail').fill(DEMO.ingrid);
    await page.getByLabel('Password').fill(DEMO.password);
    await Promise.all([
      page.waitForURL((u) => u.pathname === '/admin'),
      page.getByRole('button', { name: 'Sign in' }).click(),
    ]);
    await context.close();
  });

  it("lets an attending open a student's case from the queue and read each canal", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signIn(page, server.baseUrl, DEMO.helen, DEMO.password);
    await page.getByRole('link', { name: /Open the case of tooth 21/ }).click();
    await page.getByRole('heading', { name: /Tooth 21/ }).waitFor();
    await expect(page.getByRole('heading', { name: /^Canal / }).count()).resolves.toBe(1);
    await expect(page.getByText('Coneline records and checks lengths').count()).resolves.toBeGreaterThan(0);
    expect(await seriousViolations(page)).toEqual([]);
    await page.screenshot({ path: 'test-results/case-attending.png', fullPage: true });
    await context.close();
  });

  it('signs out with one button and lands on the sign-in page', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, server.baseUrl, DEMO.tomas, DEMO.password);
    await page.getByRole('link', { name: 'Sign out' }).click();
    await Promise.all([
      page.waitForURL((u) => u.pathname === '/signin'),
      page.getByRole('button', { name: 'Sign out of this device' }).click(),
    ]);
    await expect(page.getByRole('status').textContent()).resolves.toContain('You are signed out');
    await page.goto(`${server.baseUrl}/`);
    expect(new URL(page.url()).pathname).toBe('/signin');
    await context.close();
  });
});
