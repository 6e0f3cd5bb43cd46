/** Debian's Chromium through playwright-core, with the flags this machine needs. */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';

import { CHROMIUM_ARGS as ARGS, CHROMIUM_PATH } from '../../scripts/lib/chromium';

export { CHROMIUM_PATH };

export function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM_PATH, args: ARGS, headless: true });
}

/** A persistent context (a fresh user-data dir): needed where a test checks installability. */
export function launchPersistent(
  options: Parameters<typeof chromium.launchPersistentContext>[1] = {},
): Promise<BrowserContext> {
  const dir = mkdtempSync(join(tmpdir(), 'coneline-chromium-'));
  return chromium.launchPersistentContext(dir, {
    executablePath: CHROMIUM_PATH,
    args: ARGS,
    headless: true,
    ...options,
  });
}

/** Fills the sign-in form and waits for the page it leads to. */
export async function signIn(
  page: Page,
  baseUrl: string,
  email: string,
  password: string,
  callbackUrl = '/',
): Promise<void> {
  await page.goto(`${baseUrl}/signin?callbackUrl=${encodeURIComponent(callbackUrl)}`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await Promise.all([
    page.waitForURL((u) => !u.pathname.startsWith('/api/auth')),
    page.getByRole('button', { name: 'Sign in' }).click(),
  ]);
}
