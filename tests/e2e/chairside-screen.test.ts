// What the chairside shows, card by card, upright (768 × 1024) and sideways (1024 × 768): the
// top bar in one row; each card's answers and the canal diagram on screen without scrolling;
// diagram labels that cover nothing; rulers that say what their mark is; the sear level in one
// wording; headings that name a canal once; the value just entered gone once compaction is
// finished.
import { mkdirSync } from 'node:fs';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser } from '../helpers/browser';
import { DEMO } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';
import * as chairside from '../helpers/chairside';
import { tapScreen } from '../helpers/chairside';

// Invented scenario: an extracted lower left first molar (36), distal canal, CWL 20.5 mm,
// MAF 35, orifice 9.0 mm from the reference point; and a training block.
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

async function newSession(width: number, height: number): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport: { width, height } });
  const page = await context.newPage();
  await chairside.openChairside(page, server.baseUrl, DEMO.priya);
  return { context, page };
}

/** Everything wrong with the screen as it stands, scrolled to the top; [] when it all holds. */
function screenProblems(): string[] {
  window.scrollTo(0, 0);
  const out: string[] = [];
  const card = document.querySelector('[data-testid="step"]')?.getAttribute('data-card') ?? 'no card';
  const strip = document.querySelector('[data-testid="undo-strip"]')!;
  const bottom = strip.classList.contains('hidden') ? innerHeight : strip.getBoundingClientRect().top;
  const box = (e: Element) => e.getBoundingClientRect();
  const meets = (a: DOMRect, b: DOMRect) =>
    Math.min(a.right, b.right) - Math.max(a.left, b.left) > 0.5 &&
    Math.min(a.bottom, b.bottom) - Math.max(a.top, b.top) > 0.5;

  const bar = (document.querySelector('[data-testid="top-bar"]') ?? document.querySelector('header > div:last-child'))!;
  const tops = [...bar.children].map((c) => box(c).top);
  if (box(bar).height > 80 || Math.max(...tops) - Math.min(...tops) > 16) {
    out.push(`${card}: the top bar takes more than one row (${Math.round(box(bar).height)} px)`);
  }
  for (const b of document.querySelectorAll('[data-testid="step"] section[aria-labelledby="step-title"] button')) {
    const r = box(b);
    if (r.top < 0 || r.bottom > bottom + 0.5) {
      out.push(`${card}: "${b.textContent?.trim()}" is off screen (${Math.round(r.top)}–${Math.round(r.bottom)})`);
    }
  }
  const svg = document.querySelector('[data-testid="canal-diagram"]');
  if (svg) {
    const r = box(svg);
    if (r.top < 0 || r.bottom > bottom + 0.5) out.push(`${card}: the diagram is off screen`);
  } else if (document.querySelector('[data-testid="step"]')) out.push(`${card}: no diagram`);

  for (const d of document.querySelectorAll<SVGSVGElement>('[data-testid="canal-diagram"]')) {
    const texts = [...d.querySelectorAll('text')];
    const parts = [...d.querySelectorAll('[data-part="master"], [data-part="accessory"] line, [data-part="spreader"]')];
    for (const [i, t] of texts.entries()) {
      const m = t.getScreenCTM()!;
      const px = Number(t.getAttribute('font-size')) * Math.hypot(m.a, m.b);
      if (px < 11) out.push(`${card}: diagram label "${t.textContent}" drawn at ${px.toFixed(1)} px`);
      for (const u of texts.slice(i + 1)) {
        if (meets(box(t), box(u)))
          out.push(`${card}: diagram labels "${t.textContent}" and "${u.textContent}" overlap`);
      }
      for (const p of parts) {
        if (meets(box(t), box(p)))
          out.push(
            `${card}: diagram label "${t.textContent}" covers a ${p.closest('[data-part]')?.getAttribute('data-part')}`,
          );
      }
    }
    const sear = d.querySelector('[data-part="sear"]');
    if (sear) {
      const line = box(sear).top + box(sear).height / 2;
      for (const p of d.querySelectorAll('[data-part="master"], [data-part="accessory"], [data-part="removed"]')) {
        if (box(p).top < line - 2) out.push(`${card}: a cone is drawn above the sear line`);
      }
    }
  }
  const said = [
    ...[...document.querySelectorAll('h1, h2, h3, figcaption')].map((h) => h.textContent ?? ''),
    ...[...document.querySelectorAll('[aria-label]')].map((e) => e.getAttribute('aria-label') ?? ''),
  ];
  for (const s of said) if (/\bcanal\s+(canal|main)\b|\d\(U\b/i.test(s)) out.push(`${card}: "${s}"`);
  return out;
}

/** What each card's ruler mark must say it is. */
const MARK: Record<string, string> = {
  taper: 'the CWL less 1 mm',
  dry: 'the CWL',
  master: 'the CWL',
  accessory: 'the spreader depth',
};

/** A driver that checks the whole screen each time it waits for a card. */
class CheckingDriver extends Driver {
  problems: string[] = [];
  override async card(kind: string): Promise<void> {
    await super.card(kind);
    this.problems.push(...(await this.page.evaluate(screenProblems)));
    const mark = this.step().getByTestId('ruler-mark');
    if (kind === 'spreader') {
      const first = (await this.step().locator('#step-title').textContent())?.startsWith('Cycle 1:');
      await expect(mark.textContent()).resolves.toContain(first ? 'the CWL less 2 mm' : 'the last spreader depth');
    } else if (MARK[kind]) {
      await expect(mark.textContent()).resolves.toContain(MARK[kind]);
    }
  }
}

/** The whole canal with one short cone redone, a sear level of 1 mm below the CEJ, and the summary. */
async function walkCanal(d: CheckingDriver): Promise<void> {
  const page = d.page;
  await d.answer('seat', 'Seats and holds');
  await d.ruler('taper', 19.5);
  await d.answer('radiograph', 'Taken');
  await d.answer('rinse', 'Done');
  await d.ruler('dry', 20.5);
  await d.ruler('master', 20.5, 'ruler-master');
  await d.answer('master', 'Reached');
  await d.answer('radiograph', 'Taken');
  await d.answer('seal', 'Seated');
  for (const [i, depth] of [18.5, 16.5, 14.5, 12.5].entries()) {
    await d.ruler('spreader', depth);
    if (i === 1) {
      await d.answer('accessory', 'Stopped short');
      await d.answer('remove', 'Removed');
    }
    await d.answer('accessory', 'Reached');
  }
  await d.answer('spreader', 'Finish compaction');
  await d.card('fill');
  // The last cone's length is no longer the news.
  await expect(page.getByTestId('just-entered').count()).resolves.toBe(0);
  await d.answer('fill', 'Radiograph taken');
  await d.step().getByRole('button', { name: '✓ Radiograph taken' }).waitFor();
  await d.card('fill');
  await d.tap(d.step().getByRole('button', { name: 'Flush' }));
  await d.tap(d.step().getByRole('button', { name: 'None' }));
  await d.card('sear');
  const cej = d.step().getByTestId('ruler-cej').getByRole('button');
  const levels = await cej.evaluateAll((bs) => bs.map((b) => [b.getAttribute('aria-label'), b.textContent]));
  for (const [spoken, shown] of levels) {
    expect(spoken).toMatch(/^(\d\.\d mm (below|above) the CEJ|at the CEJ)$/);
    expect(shown).not.toMatch(/[-+−]/);
  }
  await d.tap(d.step().getByTestId('ruler-cej').locator('button[data-mm="1"]'));
  await d.answer('sear', 'At the orifice');
  await d.card('compact');
  await expect(page.getByTestId('just-entered').textContent()).resolves.toContain('1.0 mm below the CEJ');
  await expect(page.locator('figcaption').first().textContent()).resolves.toContain(
    'seared at the orifice, 1.0 mm below the CEJ',
  );
  await d.answer('compact', 'Done');
  await d.answer('clean', 'Done');
  await d.card('done');
  await tapScreen(page, page.getByRole('button', { name: /^Timeline/ }));
  await expect(page.getByTestId('timeline').textContent()).resolves.toContain(
    'Seared at the orifice, 1.0 mm below the CEJ',
  );
  await d.answer('done', 'Finish the tooth');
  await page.getByRole('heading', { name: 'D canal' }).waitFor();
  d.problems.push(...(await page.evaluate(screenProblems)).filter((p) => !p.includes('off screen')));
}

describe('the chairside screen', () => {
  it.each([
    [768, 1024],
    [1024, 768],
  ])(
    'at %i × %i keeps the top bar in one row and each card’s answers and diagram on screen, with clear labels',
    async (width, height) => {
      const { context, page } = await newSession(width, height);
      await tapScreen(page, page.getByTestId('new-case'));
      await tapScreen(page, page.getByRole('button', { name: 'Extracted tooth' }));
      await tapScreen(page, page.getByTestId('quadrant-3'));
      await tapScreen(page, page.getByTestId('tooth-36'));
      await tapScreen(page, page.getByTestId('canal-MB'));
      await tapScreen(page, page.getByTestId('canal-ML'));
      await tapScreen(page, page.getByTestId('canals-confirm'));
      await expect(page.getByTestId('ruler-cwl').getByTestId('ruler-mark').textContent()).resolves.toContain(
        'the textbook average length less 1 mm',
      );
      await tapScreen(page, page.getByTestId('ruler-cwl').locator('button[data-mm="20.5"]'));
      await tapScreen(page, page.getByTestId('maf-35'));
      await tapScreen(page, page.getByTestId('ruler-orifice').locator('button[data-mm="9"]'));
      await tapScreen(page, page.getByTestId('save-canal'));
      const d = new CheckingDriver(page);
      await walkCanal(d);
      await page.screenshot({ path: `test-results/chairside-screen-${width}x${height}-summary.png`, fullPage: true });
      expect([...new Set(d.problems)]).toEqual([]);
      expect(await seriousViolations(page)).toEqual([]);
      await context.close();
    },
    180_000,
  );

  it('names a training block’s canal once in every heading, and the tooth with its Universal number', async () => {
    const { context, page } = await newSession(768, 1024);
    await tapScreen(page, page.getByTestId('new-case'));
    await tapScreen(page, page.getByRole('button', { name: 'Training block' }));
    await tapScreen(page, page.getByTestId('canals-confirm'));
    await page.getByRole('heading', { name: 'Set up the Main canal' }).waitFor();
    await tapScreen(page, page.getByTestId('ruler-cwl').locator('button[data-mark]'));
    await tapScreen(page, page.getByTestId('maf-30'));
    await tapScreen(page, page.getByTestId('save-canal'));
    const d = new CheckingDriver(page);
    await d.card('seat');
    await expect(page.getByRole('complementary', { name: 'Diagram of the Main canal' }).count()).resolves.toBe(1);
    expect(d.problems).toEqual([]);
    await context.close();

    const upright = await newSession(768, 1024);
    await setUpDistal36(upright.page);
    const label = upright.page.getByTestId('case-label');
    await label.getByRole('button').click();
    await expect(label.textContent()).resolves.toContain('Tooth 36 (Universal 19)');
    await upright.context.close();
  });

  it('clears the value just entered when any answer is withdrawn', async () => {
    const { context, page } = await newSession(1024, 768);
    await setUpDistal36(page);
    const d = new Driver(page);
    await d.answer('seat', 'Seats and holds');
    await d.ruler('taper', 19.5);
    await d.card('radiograph');
    await expect(page.getByTestId('just-entered').textContent()).resolves.toContain('19.5 mm');
    await tapScreen(page, page.getByRole('button', { name: /^Timeline/ }));
    const row = page.getByTestId('timeline').getByRole('listitem').filter({ hasText: 'MAF seat check' });
    await tapScreen(page, row.getByRole('button', { name: 'Withdraw' }));
    await d.card('seat');
    await expect(page.getByTestId('just-entered').count()).resolves.toBe(0);
    await context.close();
  });
});
