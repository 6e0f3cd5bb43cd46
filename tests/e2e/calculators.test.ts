// The calculators page in Chromium: each calculator used by taps alone (rulers, the keypad,
// chips), every derived length rounded toward shorter with the exact value beside it, targets
// big enough for gloves, axe clean, no policy violation, open with no network after one
// visit, and none of the chairside's scripts but React's.
import AxeBuilder from '@axe-core/playwright';
import { mkdirSync } from 'node:fs';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, signIn } from '../helpers/browser';
import { DEMO } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';

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

/** Taps a calculator's tab and waits for it. */
async function open(page: Page, label: string, hash: string): Promise<void> {
  await page.getByRole('navigation', { name: 'Calculators' }).getByRole('link', { name: label }).click();
  await page.locator(`[data-calculator="${hash}"]`).waitFor();
}
const ruler = (page: Page, input: string, mm: number) =>
  page.getByTestId(`${input}-ruler`).locator(`button[data-mm="${mm}"]`).click();
const chip = (page: Page, name: string) => page.getByRole('button', { name, exact: true }).click();
/** Types a length on the keypad of one input, key by key, and uses it. */
async function type(page: Page, input: string, keys: string): Promise<void> {
  await page
    .getByTestId(input)
    .getByRole('button', { name: /^Type it/ })
    .click();
  const pad = page.getByTestId(`${input}-keypad`);
  for (const k of keys) await pad.getByRole('button', { name: k === '.' ? 'decimal point' : k, exact: true }).click();
  await pad.getByRole('button', { name: /^Use / }).click();
}
/** The big (floored) value of a result, and the exact one beside it. */
async function result(page: Page, id: string): Promise<{ shown: string; text: string }> {
  const box = page.getByTestId(id);
  return { shown: (await box.getByTestId(`${id}-shown`).textContent())!.trim(), text: (await box.textContent())! };
}

/** Controls smaller than 56 × 56 px, and ruler or keypad keys smaller than 64 × 64 (gloved hands). */
function undersized(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const out: string[] = [];
    for (const el of document.querySelectorAll<HTMLElement>('button, a[href], input, select, textarea, [tabindex]')) {
      const r = el.getBoundingClientRect();
      if (r.width === 0 && r.height === 0) continue;
      if (el.classList.contains('skip-link')) continue; // off screen until focused
      const key = el.closest('[data-testid$="-ruler"], [data-testid$="-keypad"]') !== null;
      const min = key ? 64 : 56;
      if (r.width < min - 0.5 || r.height < min - 0.5)
        out.push(
          `${el.tagName} "${el.textContent?.trim().slice(0, 30)}" ${Math.round(r.width)}×${Math.round(r.height)}`,
        );
    }
    return out;
  });
}
async function axeViolations(page: Page): Promise<string[]> {
  const { violations } = await new AxeBuilder({ page }).analyze();
  return violations.map((v) => `${v.id} (${v.impact}): ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`);
}
async function checkPage(page: Page, name: string): Promise<void> {
  expect(await undersized(page), name).toEqual([]);
  expect(await axeViolations(page), name).toEqual([]);
}

describe('the calculators page', () => {
  it('is linked from the home page of a signed-in attending', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
    const page = await context.newPage();
    await signIn(page, server.baseUrl, DEMO.helen, DEMO.password);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Calculators' }).click();
    await page.waitForURL((u) => u.pathname === '/calculators');
    await page.getByTestId('calculators').waitFor();
    await expect(page.locator('main').textContent()).resolves.toContain(
      'clinical decisions rest with you, your attending and your school',
    );
    await context.close();
  });

  for (const [width, height] of [
    [768, 1024],
    [390, 844],
  ] as const) {
    it(`works each calculator by taps at ${width}×${height}, rounding every derived length toward shorter`, async () => {
      const context = await browser.newContext({ viewport: { width, height } });
      // Content-Security-Policy violations, collected before any of the page's own scripts run.
      await context.addInitScript(() => {
        const seen: string[] = [];
        (window as unknown as { __violations: string[] }).__violations = seen;
        document.addEventListener('securitypolicyviolation', (e) =>
          seen.push(`${e.violatedDirective} ${e.blockedURI}`),
        );
      });
      const page = await context.newPage();
      const shot = (name: string) =>
        page.screenshot({ path: `test-results/calculators-${name}-${width}x${height}.png`, fullPage: true });
      await page.goto(`${server.baseUrl}/calculators`);
      await page.locator('[data-calculator="working-length"]').waitFor();
      await expect(page.title()).resolves.toBe('Calculators · Coneline');

      // Radiographic (discrepancy) method (Ingle; Weine; Grossman 13th ed. — seen): the worked
      // example 22.0 + 2.0 − 1 = 23.0, then a tip 1.3 mm short read off the radiograph.
      await ruler(page, 'discrepancy-file', 22);
      await ruler(page, 'discrepancy-distance', 2);
      expect((await result(page, 'discrepancy-result')).shown).toBe('23.0 mm');
      await ruler(page, 'discrepancy-file', 22.5);
      await type(page, 'discrepancy-distance', '1.3');
      let r = await result(page, 'discrepancy-result');
      expect(r.shown).toBe('22.5 mm'); // 22.5 + 1.3 − 1 = 22.80, rounded down
      expect(r.text).toContain('exact 22.80 mm');
      await chip(page, 'Bone (1.5 mm short)');
      expect((await result(page, 'discrepancy-result')).shown).toBe('22.0 mm'); // 22.30
      await chip(page, 'Beyond the apex');
      r = await result(page, 'discrepancy-result');
      expect(r.shown).toBe('19.5 mm'); // 22.5 − 1.3 − 1.5 = 19.70
      expect(r.text).toContain('exact 19.70 mm');
      await checkPage(page, 'radiographic method');
      await shot('radiograph');

      // Electronic apex locator (Jung et al. — seen): 21.3 − 0.5 = 20.80 → 20.5; − 1.0 → 20.0.
      await chip(page, 'Apex locator');
      await type(page, 'apex-locator-reading', '21.3');
      expect((await result(page, 'apex-locator-result')).shown).toBe('20.5 mm');
      await chip(page, '1.0 mm');
      r = await result(page, 'apex-locator-result');
      expect(r.shown).toBe('20.0 mm');
      expect(r.text).toContain('exact 20.30 mm');

      // Grossman's proportional method: 20 × 25 ÷ 22 = 22.73 → 22.5 mm; less 1 mm, 21.73 → 21.5 mm.
      await chip(page, 'Proportion');
      await ruler(page, 'proportional-file', 20);
      await page
        .getByTestId('proportional-radiograph-tooth')
        .getByRole('button', { name: /^Type it/ })
        .click();
      await checkPage(page, 'keypad open');
      await page
        .getByTestId('proportional-radiograph-tooth-keypad')
        .getByRole('button', { name: 'Back to the ruler' })
        .click();
      await type(page, 'proportional-radiograph-tooth', '25');
      await ruler(page, 'proportional-radiograph-file', 22);
      r = await result(page, 'proportional-actual');
      expect(r.shown).toBe('22.5 mm');
      expect(r.text).toContain('exact 22.73 mm');
      r = await result(page, 'proportional-result');
      expect(r.shown).toBe('21.5 mm');
      expect(r.text).toContain('exact 21.73 mm');
      await expect(page.getByTestId('sources').textContent()).resolves.toContain('Grossman');
      await checkPage(page, 'proportional method');
      await shot('proportional');

      // Step-back (Mullaney 1979 — seen): MAF 25 at a CWL of 21.0, then 30, 35, 40 at 1, 2, 3 mm short.
      await open(page, 'Step-back', 'step-back');
      await page.getByTestId('step-back-maf-25').click();
      await ruler(page, 'step-back-cwl', 21);
      await chip(page, '1.0 mm');
      const schedule = () =>
        page
          .getByTestId('step-back-result')
          .locator('tr[data-size]')
          .evaluateAll((rows) =>
            rows.map((tr) => `${(tr as HTMLElement).dataset.size}@${(tr as HTMLElement).dataset.mm}`),
          );
      await expect(schedule()).resolves.toEqual(['30@20', '35@19', '40@18']);
      // 0.5 mm per size, four files (Allison 1979; dental texts — seen, sources differ).
      await chip(page, '0.5 mm');
      await chip(page, '4');
      await expect(schedule()).resolves.toEqual(['30@20.5', '35@20', '40@19.5', '45@19']);
      // A typed CWL of 21.3 mm: every file rounded down, never past its exact length.
      await chip(page, '1.0 mm');
      await type(page, 'step-back-cwl', '21.3');
      await expect(schedule()).resolves.toEqual(['30@20', '35@19', '40@18', '45@17']);
      await expect(page.getByTestId('step-back-result').textContent()).resolves.toContain('20.30 mm');
      await checkPage(page, 'step-back');
      await shot('step-back');

      // Canal thirds (docs/rules.md): orifice 9.0, CWL 20.5 → the coronal third ends at 12.83 → 12.5.
      await open(page, 'Canal thirds', 'thirds');
      await ruler(page, 'thirds-cwl', 20.5);
      await ruler(page, 'thirds-orifice', 9);
      await expect(page.getByTestId('thirds-complete').getAttribute('data-mm')).resolves.toBe('12.5');
      await expect(page.getByTestId('thirds-result').textContent()).resolves.toContain('12.83');
      // Not measured: the orifice is estimated from the 12 mm stop depth (CWL 21 → orifice 7.5, end 12.0).
      await ruler(page, 'thirds-cwl', 21);
      await chip(page, 'Not measured');
      await expect(page.getByTestId('thirds-complete').textContent()).resolves.toBe('12.0 mm or less');
      await expect(page.getByTestId('thirds-result').textContent()).resolves.toContain(
        'Orifice depth estimated: 7.5 mm',
      );
      // An upper canine (27 mm on average) scales the stop depth to 12 × 27 ÷ 21 = 15.43 mm (judgement):
      // the orifice is then kept at half the CWL, 10.5 mm, and the coronal third ends at 14.0 mm.
      await chip(page, 'Upper canine');
      await expect(page.getByTestId('thirds-complete').textContent()).resolves.toBe('14.0 mm or less');
      await expect(page.getByTestId('thirds-result').textContent()).resolves.toContain('stop depth of 15.43 mm');
      await checkPage(page, 'canal thirds');
      await shot('thirds');

      // ISO sizes (ISO 3630-1 as summarised — seen, partly; 06 pink — memory).
      await open(page, 'ISO sizes', 'iso-sizes');
      await page.getByTestId('iso-30').click();
      await expect(page.getByTestId('iso-colour').textContent()).resolves.toBe('blue');
      await expect(page.getByTestId('iso-d0').textContent()).resolves.toBe('0.30 mm');
      await expect(page.getByTestId('iso-d16').textContent()).resolves.toBe('0.62 mm');
      await page.getByTestId('iso-06').click();
      await expect(page.getByTestId('iso-colour').textContent()).resolves.toBe('pink');
      await expect(page.getByTestId('iso-d16').textContent()).resolves.toBe('0.38 mm');
      await checkPage(page, 'ISO sizes');
      await shot('iso');

      // FDI ↔ Universal (ISO 3950; HL7 FHIR pairs — seen): 36 ↔ 19, 18 ↔ 1, 46 ↔ 30, 55 ↔ A.
      await open(page, 'Tooth numbers', 'tooth-numbers');
      const pair = async () =>
        `${await page.getByTestId('tooth-fdi').textContent()}↔${await page.getByTestId('tooth-universal').textContent()}`;
      await page.getByTestId('fdi-quadrant-3').click();
      await page.getByTestId('fdi-tooth-6').click();
      await expect(pair()).resolves.toBe('36↔19');
      await expect(page.getByTestId('tooth-result').textContent()).resolves.toContain('mandibular left first molar');
      await page.getByTestId('fdi-quadrant-1').click();
      await page.getByTestId('fdi-tooth-8').click();
      await expect(pair()).resolves.toBe('18↔1');
      await page.getByTestId('from-universal').click();
      await page.getByTestId('universal-30').click();
      await expect(pair()).resolves.toBe('46↔30');
      await page.getByTestId('universal-A').click();
      await expect(pair()).resolves.toBe('55↔A');
      await checkPage(page, 'tooth numbers');
      await shot('teeth');

      // The address names the calculator: a reload and the back button keep to it.
      expect(new URL(page.url()).hash).toBe('#tooth-numbers');
      await page.goBack();
      await page.locator('[data-calculator="iso-sizes"]').waitFor();
      expect(await page.evaluate(() => (window as unknown as { __violations: string[] }).__violations)).toEqual([]);
      await context.close();
    });
  }

  it('opens with no network after one visit, and still calculates', async () => {
    const context = await browser.newContext({ viewport: { width: 768, height: 1024 } });
    const page = await context.newPage();
    await page.goto(`${server.baseUrl}/calculators`);
    await page.evaluate(async () => {
      await navigator.serviceWorker.ready;
    });
    // The first visit installs the worker; the next load is controlled by it (registerType "prompt").
    await page.reload();
    await page.getByTestId('calculators').waitFor();
    expect(await page.evaluate(() => navigator.serviceWorker.controller !== null)).toBe(true);

    await context.setOffline(true);
    expect(await page.evaluate(async () => (await fetch('/api/health').catch(() => null)) === null)).toBe(true);
    await page.goto(`${server.baseUrl}/calculators#tooth-numbers`);
    await page.locator('[data-calculator="tooth-numbers"]').waitFor();
    await page.reload();
    await page.locator('[data-calculator="tooth-numbers"]').waitFor();
    await page.getByTestId('fdi-quadrant-4').click();
    await page.getByTestId('fdi-tooth-6').click();
    await expect(page.getByTestId('tooth-universal').textContent()).resolves.toBe('30');
    await open(page, 'Working length', 'working-length');
    await ruler(page, 'discrepancy-file', 21);
    await ruler(page, 'discrepancy-distance', 1.5);
    expect((await result(page, 'discrepancy-result')).shown).toBe('21.5 mm');
    // The chairside shell still opens offline from the same worker.
    await page.goto(`${server.baseUrl}/chairside`);
    await expect(page.title()).resolves.toContain('Chairside');
    await context.close();
  });

  it("loads none of the chairside's scripts but React's, and is in the service worker's precache", async () => {
    /** Same-origin scripts a page's HTML names, and all they import statically. */
    async function scriptsOf(path: string): Promise<Set<string>> {
      const html = await (await fetch(server.baseUrl + path)).text();
      const queue = [...html.matchAll(/\/_astro\/[\w.-]+\.js/g)].map((m) => new URL(m[0], server.baseUrl).href);
      const seen = new Set<string>();
      while (queue.length > 0) {
        const url = queue.shift()!;
        if (seen.has(url)) continue;
        seen.add(url);
        const text = await (await fetch(url)).text();
        for (const m of text.matchAll(/(?:\bfrom\s*|\bimport\s*)["']([^"']+\.js)["']/g))
          queue.push(new URL(m[1]!, url).href);
      }
      return seen;
    }
    const chairside = await scriptsOf('/chairside');
    const calculators = await scriptsOf('/calculators');
    const name = (u: string) => new URL(u).pathname.split('/').pop()!;
    expect([...calculators].map(name).some((n) => n.startsWith('CalculatorsApp.'))).toBe(true);
    const shared = [...calculators].filter((u) => chairside.has(u)).map(name);
    // The React renderer (client.*.js, Astro's) and React itself (react.*.js, our manual chunk).
    expect(shared.map((n) => n.split('.')[0]).sort()).toEqual(['client', 'react']);

    // Its inline scripts are allowed by their hashes, sent as a header like the chairside's.
    const csp = (await fetch(`${server.baseUrl}/calculators`)).headers.get('content-security-policy') ?? '';
    expect(csp).toMatch(/script-src 'self' 'sha256-/);
    expect(csp).not.toContain('unsafe-inline');

    const sw = await (await fetch(`${server.baseUrl}/sw.js`)).text();
    expect(sw).toMatch(/url:\s*"calculators"/);
    for (const u of calculators) expect(sw, name(u)).toContain(`_astro/${name(u)}`);
  });
});
