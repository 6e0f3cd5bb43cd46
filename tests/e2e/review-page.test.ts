// The case page as the review page, in Chromium at 1280×800: the seeded attending (Dr Helen
// Vasquez) opens a case her student Mira submitted, moves between canals with the navigator
// and by address, comments on a canal and on one step, is refused a final approval while a
// stop is open, and returns the case with a comment and ratings; Mira, in her own browser,
// finds it came back on her home page and answers. Then the seeded incisor of Tomas is
// approved and reopened. Invented scenario: an extracted lower right first molar (46) with a
// distal canal done by the book and a mesiobuccal canal whose taper check stopped 3 mm short.
import { mkdirSync } from 'node:fs';
import { randomUUID } from 'node:crypto';
import AxeBuilder from '@axe-core/playwright';
import type { Browser, BrowserContext, Locator, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, signIn } from '../helpers/browser';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { EventWriter } from '../helpers/events';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let browser: Browser;
let mira: ApiClient;
const molar = new EventWriter();
let d = '';
let mb = '';
let shortTaper = '';

beforeAll(async () => {
  mkdirSync('test-results', { recursive: true });
  [server, browser] = await Promise.all([startServer(), launchBrowser()]);
  mira = await apiSignIn(server.baseUrl, DEMO.mira, DEMO.password);
  molar.open('extracted', 46);
  d = molar.canal('D', 21);
  mb = molar.canal('MB', 20);
  molar.textbook(d, 21);
  molar.textbook(mb, 20);
  const taper = molar.events.find((e) => e.type === 'taper.checked' && e.canalId === mb)!;
  taper.data = { spreader: 'MF', depthMm: 17 };
  shortTaper = taper.id;
  molar.add('case.submitted');
  const res = await mira.post('/api/sync', { deviceId: 'review-page-test', events: molar.events });
  const results = ((await res.json()) as { results: { status: string }[] }).results;
  expect(results.every((r) => r.status === 'stored')).toBe(true);
});
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function session(email: string, width = 1280, height = 800): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport: { width, height } });
  const page = await context.newPage();
  await signIn(page, server.baseUrl, email, DEMO.password);
  return { context, page };
}

/** Opens a page and waits until its islands have hydrated (Astro drops `ssr` from each). */
async function open(page: Page, path: string): Promise<void> {
  await page.goto(server.baseUrl + path);
  await page.waitForFunction(() => document.querySelectorAll('astro-island[ssr]').length === 0);
}

async function violations(page: Page): Promise<string[]> {
  const result = await new AxeBuilder({ page }).analyze();
  return result.violations.map(
    (v) => `${v.impact}: ${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).join(', ')})`,
  );
}

const panel = (page: Page, canalId: string) => page.locator(`[data-canal-panel="${canalId}"]`);
const navLink = (page: Page, name: RegExp) =>
  page.getByRole('navigation', { name: 'Canals' }).getByRole('link', { name });
/** What a reader sees of an element: its rendered text, spaces collapsed. */
const seen = async (l: Locator) => (await l.innerText()).replace(/\s+/g, ' ').trim();

async function commentsOnServer(): Promise<
  { text: string; canalId: string | null; eventId: string | null; id: string }[]
> {
  const res = await mira.fetch(`/api/cases/${molar.caseId}/comments`);
  return (
    (await res.json()) as { comments: { text: string; canalId: string | null; eventId: string | null; id: string }[] }
  ).comments;
}

describe('the review page for the attending, on a desktop', () => {
  it('shows the canals side by side, and the navigator and the address each open one canal', async () => {
    const { context, page } = await session(DEMO.helen);
    await open(page, `/cases/${molar.caseId}`);
    await expect(page.getByTestId('case-state').textContent()).resolves.toBe('Waiting for review');
    // Side by side: both canals on one row.
    const [boxD, boxMb] = [await panel(page, d).boundingBox(), await panel(page, mb).boundingBox()];
    expect(Math.abs(boxD!.y - boxMb!.y)).toBeLessThan(2);
    expect(boxMb!.x).toBeGreaterThan(boxD!.x + boxD!.width - 1);
    // The navigator names each canal with its state and counts.
    await expect(navLink(page, /MB canal/).textContent()).resolves.toMatch(/1 stop/);
    const dLink = await seen(navLink(page, /D canal/));
    expect(dLink).not.toMatch(/stop/);
    expect(dLink).toMatch(/▲ \d+ cautions?/);
    // Each finding beside the event that raised it, in words.
    const raised = panel(page, mb).getByTestId('raised-by').first();
    await expect(seen(raised)).resolves.toMatch(/^Raised by \d\d:\d\d · Taper check, spreader MF: 17\.0 mm$/);
    expect(await violations(page)).toEqual([]);
    await page.screenshot({ path: 'test-results/review-page-all-canals.png', fullPage: true });

    await navLink(page, /MB canal/).click();
    expect(new URL(page.url()).hash).toBe(`#canal-${mb}`);
    await expect(panel(page, d).isHidden()).resolves.toBe(true);
    await expect(panel(page, mb).getByRole('heading', { name: 'Timeline' }).isVisible()).resolves.toBe(true);
    await expect(navLink(page, /MB canal/).getAttribute('aria-current')).resolves.toBe('true');
    // The heading takes the focus, so a screen reader reads where the link led.
    await expect(page.evaluate(() => document.activeElement?.id)).resolves.toBe(`canal-${mb}`);

    // With the keyboard: the link to the D canal, then Enter.
    await navLink(page, /D canal/).focus();
    await page.keyboard.press('Enter');
    await page.waitForURL((u) => u.hash === `#canal-${d}`);
    await expect(panel(page, mb).isHidden()).resolves.toBe(true);
    await expect(panel(page, d).isVisible()).resolves.toBe(true);

    // A link from the queue or an e-mail lands on the canal it names.
    await open(page, `/cases/${molar.caseId}#canal-${mb}`);
    await expect(panel(page, d).isHidden()).resolves.toBe(true);
    await expect(panel(page, mb).isVisible()).resolves.toBe(true);
    // The sign-off panel's canal follows the canal chosen.
    await page.getByTestId('signoff-form').getByLabel('Fill check of a canal').check();
    await expect(page.getByLabel('Canal', { exact: true }).inputValue()).resolves.toBe(mb);
    await page.screenshot({ path: 'test-results/review-page-mb-canal.png', fullPage: true });

    await navLink(page, /All canals/).click();
    await expect(panel(page, d).isVisible()).resolves.toBe(true);
    await expect(panel(page, mb).getByRole('heading', { name: 'Timeline' }).isVisible()).resolves.toBe(false);
    await context.close();
  });

  it('posts a comment on a canal and one on a step, keeps an unsent one marked and sends it again under the same id', async () => {
    const { context, page } = await session(DEMO.helen);
    await open(page, `/cases/${molar.caseId}#canal-${mb}`);
    const mbPanel = panel(page, mb);

    // Too long: the counter says so and nothing is sent.
    const box = mbPanel.getByLabel('Your comment on the MB canal');
    await box.fill('x'.repeat(2001));
    await expect(mbPanel.getByText('2,001 / 2,000 characters').isVisible()).resolves.toBe(true);
    await mbPanel.getByRole('button', { name: 'Post comment' }).click();
    await expect(mbPanel.getByRole('alert').textContent()).resolves.toContain('At most 2,000 characters.');
    expect(await commentsOnServer()).toEqual([]);

    await box.fill('Compare the taper check with the MAF radiograph.');
    await mbPanel.getByRole('button', { name: 'Post comment' }).click();
    const stored = mbPanel.locator('[data-testid="thread"] [data-testid="comment"][data-state="stored"]');
    await stored.waitFor();
    await expect(seen(stored)).resolves.toMatch(/^Dr Helen Vasquez · attending · .* Compare the taper check/);

    // On the step that raised the stop, from the button beside it. The first try gets no answer.
    const sent: string[] = [];
    page.on('request', (r) => {
      if (r.method() === 'POST' && r.url().endsWith('/comments')) sent.push(r.postData() ?? '');
    });
    await page.route('**/api/cases/*/comments', (route) => route.abort('internetdisconnected'));
    const step = page.locator(`#event-${shortTaper}`);
    await step.getByRole('button', { name: /^Comment on .*Taper check, spreader MF: 17\.0 mm/ }).click();
    await step.getByLabel(/Your comment on this step/).fill('Three millimetres short: what stopped the spreader?');
    await step.getByRole('button', { name: 'Post comment' }).click();
    const failed = step.locator('[data-testid="comment"][data-state="failed"]');
    await failed.waitFor();
    await expect(failed.textContent()).resolves.toContain('Not sent:');
    await page.unroute('**/api/cases/*/comments');
    await failed.getByRole('button', { name: 'Send again' }).click();
    await step.locator('[data-testid="comment"][data-state="stored"]').waitFor();
    expect(sent).toHaveLength(2);
    expect(JSON.parse(sent[0]!).id).toBe(JSON.parse(sent[1]!).id);

    const onServer = await commentsOnServer();
    expect(onServer.map((c) => [c.text, c.canalId, c.eventId])).toEqual([
      ['Compare the taper check with the MAF radiograph.', mb, null],
      ['Three millimetres short: what stopped the spreader?', mb, shortTaper],
    ]);
    // Loaded again, both are there, each where it was posted.
    await open(page, `/cases/${molar.caseId}#event-${shortTaper}`);
    await expect(page.locator(`#event-${shortTaper}`).textContent()).resolves.toContain('what stopped the spreader?');
    expect(await violations(page)).toEqual([]);
    await context.close();
  });

  it('shows why a final approval with an open stop is refused, then returns the case with a comment and ratings', async () => {
    const { context, page } = await session(DEMO.helen);
    await open(page, `/cases/${molar.caseId}`);
    const form = page.getByTestId('signoff-form');
    await form.getByLabel('The whole case (final)').check();
    await form.getByLabel('Approve').check();
    await form.getByRole('button', { name: 'Approve' }).click();
    const problem = page.getByTestId('signoff-problem');
    await problem.waitFor();
    await expect(problem.textContent()).resolves.toMatch(/cannot be signed off with 1 open stop/);
    await expect(page.getByTestId('signoff-history').locator('li').count()).resolves.toBe(0);

    await form.getByLabel('Return to the student').check();
    await form.getByRole('button', { name: 'Return to the student' }).click();
    await expect(form.getByText('A return needs a comment saying what to put right.').isVisible()).resolves.toBe(true);
    await form
      .getByLabel(/^Comment/)
      .fill('The MB taper check stopped 3 mm short: shape it to length, then fill again.');
    const mbRatings = form.getByRole('group', { name: 'Ratings for the MB canal (optional)' });
    await mbRatings.getByLabel('Fill length').selectOption('2');
    await mbRatings.getByLabel('Taper').selectOption('1');
    await form
      .getByRole('group', { name: 'Ratings for the D canal (optional)' })
      .getByLabel('Density')
      .selectOption('4');
    await Promise.all([page.waitForEvent('load'), form.getByRole('button', { name: 'Return to the student' }).click()]);
    await page.getByText('Returned to the student: the whole case.').waitFor();
    await expect(page.getByTestId('case-state').textContent()).resolves.toBe('Returned');
    const history = await seen(page.getByTestId('signoff-history'));
    expect(history).toContain('Whole case: returned — Dr Helen Vasquez');
    expect(history).toContain('Ratings for the MB canal Fill length 2 · Getting there Taper 1 · Not yet');
    expect(history).toContain('Ratings for the D canal Density 4 · Exemplary');
    await page.screenshot({ path: 'test-results/review-page-returned.png', fullPage: true });
    await context.close();
  });
});

describe('the student side', () => {
  it('shows on the home page that the case came back, with the comment and who returned it', async () => {
    const { context, page } = await session(DEMO.mira);
    const card = page.locator(`[data-testid="came-back"][data-case="${molar.caseId}"]`);
    await expect(seen(card)).resolves.toMatch(
      /^↩ Came back Tooth 46 .* returned by Dr Helen Vasquez, .* The MB taper check stopped 3 mm short/,
    );
    await expect(seen(page.getByTestId('latest-signoffs'))).resolves.toMatch(
      /Tooth 46 \(Universal 30\) · Whole case: returned — Dr Helen Vasquez/,
    );
    await expect(seen(page.getByRole('row', { name: /46/ }).first())).resolves.toMatch(/Returned ↩ came back/);
    await expect(page.getByText('Coneline records and checks lengths').count()).resolves.toBeGreaterThan(0);
    expect(await violations(page)).toEqual([]);
    await page.screenshot({ path: 'test-results/review-student-home.png', fullPage: true });

    await Promise.all([page.waitForURL(`**/cases/${molar.caseId}`), card.getByRole('link').click()]);
    await page.waitForFunction(() => document.querySelectorAll('astro-island[ssr]').length === 0);
    await expect(page.getByTestId('came-back').textContent()).resolves.toContain('This case came back to you');
    await expect(page.getByTestId('signoff-panel').count()).resolves.toBe(0);
    await expect(page.getByRole('heading', { name: 'Sign off' }).count()).resolves.toBe(0);
    await expect(seen(page.getByTestId('signoff-history'))).resolves.toContain('Fill length 2 · Getting there');
    await expect(page.locator(`#event-${shortTaper}`).textContent()).resolves.toContain('what stopped the spreader?');
    await navLink(page, /MB canal/).click();
    const mbPanel = panel(page, mb);
    await mbPanel
      .getByLabel('Your comment on the MB canal')
      .fill('The spreader met a ledge at 17 mm; I will re-shape.');
    await mbPanel.getByRole('button', { name: 'Post comment' }).click();
    await mbPanel.locator('[data-testid="comment"][data-state="stored"]', { hasText: 'ledge' }).waitFor();
    expect(await violations(page)).toEqual([]);
    await page.screenshot({ path: 'test-results/review-student-case.png', fullPage: true });
    await context.close();

    const reply = (await commentsOnServer()).at(-1)!;
    expect(reply).toMatchObject({
      canalId: mb,
      eventId: null,
      text: 'The spreader met a ledge at 17 mm; I will re-shape.',
    });
    // The attending reads the answer on the same page.
    const helen = await session(DEMO.helen);
    await open(helen.page, `/cases/${molar.caseId}#canal-${mb}`);
    await expect(seen(panel(helen.page, mb).getByTestId('thread'))).resolves.toMatch(
      /Mira Okafor · student · .* The spreader met a ledge at 17 mm/,
    );
    await helen.context.close();
  });
});

describe('approving and reopening', () => {
  it('approves a submitted case, then reopens it with a reason and keeps the approval marked superseded', async () => {
    // The demo's incisor of Tomas's: submitted, filled, with a caution only.
    const helenApi = await apiSignIn(server.baseUrl, DEMO.helen, DEMO.password);
    const { cases } = (await (await helenApi.fetch('/api/cases')).json()) as {
      cases: { caseId: string; tooth: number | null; reviewStatus: string }[];
    };
    const incisor = cases.find((c) => c.tooth === 21 && c.reviewStatus === 'submitted')!;
    const { context, page } = await session(DEMO.helen);
    await open(page, `/cases/${incisor.caseId}`);
    const form = page.getByTestId('signoff-form');
    await form.getByLabel('The whole case (final)').check();
    await form.getByLabel('Approve').check();
    await Promise.all([page.waitForEvent('load'), form.getByRole('button', { name: 'Approve' }).click()]);
    await page.getByText('Approved: the whole case.').waitFor();
    await expect(page.getByTestId('case-state').textContent()).resolves.toBe('Signed off');

    const reopen = page.getByTestId('reopen-form');
    await reopen.getByRole('button', { name: 'Reopen the case' }).click();
    await expect(reopen.getByText('Say why the case is reopened.').isVisible()).resolves.toBe(true);
    await reopen.getByLabel(/Why it is reopened/).fill('The post-op radiograph needs a second angle.');
    await Promise.all([page.waitForEvent('load'), reopen.getByRole('button', { name: 'Reopen the case' }).click()]);
    await page.getByText('Reopened: the case is open to the student again.').waitFor();
    await expect(page.getByTestId('case-state').textContent()).resolves.toBe('In progress');
    const items = page.getByTestId('signoff');
    await expect(seen(items.nth(0))).resolves.toMatch(
      /^Reopened — Dr Helen Vasquez, .* The post-op radiograph needs a second angle\.$/,
    );
    await expect(items.nth(1).getAttribute('data-superseded')).resolves.toBe('true');
    await expect(seen(items.nth(1))).resolves.toMatch(
      /^Whole case: approved — Dr Helen Vasquez, .* Superseded: the case was reopened /,
    );
    expect(await violations(page)).toEqual([]);
    await page.screenshot({ path: 'test-results/review-page-reopened.png', fullPage: true });
    await context.close();
  });

  it('tells the attending in plain words when the case changed since the page was opened', async () => {
    // Two tabs of the same attending: the first returns the case, the second still shows it waiting.
    const w = new EventWriter();
    w.open('extracted', 47);
    w.textbook(w.canal('D', 21), 21);
    w.add('case.submitted');
    expect((await mira.post('/api/sync', { deviceId: 'review-page-test', events: w.events })).status).toBe(200);
    const { context, page } = await session(DEMO.helen);
    await open(page, `/cases/${w.caseId}`);
    const helen = await apiSignIn(server.baseUrl, DEMO.helen, DEMO.password);
    const first = await helen.post(`/api/cases/${w.caseId}/signoffs`, {
      id: randomUUID(),
      checkpoint: 'final',
      decision: 'return',
      comment: 'Sent back from the other tab.',
      expectedState: 'submitted',
    });
    expect(first.status).toBe(201);
    const form = page.getByTestId('signoff-form');
    await form.getByLabel('The whole case (final)').check();
    await form.getByLabel('Approve').check();
    await form.getByRole('button', { name: 'Approve' }).click();
    await expect(page.getByTestId('signoff-problem').textContent()).resolves.toMatch(
      /This case is now "Returned", not "Waiting for review"/,
    );
    await expect(page.getByRole('button', { name: 'Load the case again' }).isVisible()).resolves.toBe(true);
    await context.close();
  });
});

describe("the page's scripts", () => {
  it("share no script of ours with the chairside, so the tablet's first paint carries nothing of them", async () => {
    /** Same-origin scripts a page's HTML names, and all they import statically. */
    async function scriptsOf(client: ApiClient, path: string): Promise<Set<string>> {
      const html = await (await client.fetch(path)).text();
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
    const helen = await apiSignIn(server.baseUrl, DEMO.helen, DEMO.password);
    const chairside = await scriptsOf(mira, '/chairside');
    const review = await scriptsOf(helen, `/cases/${molar.caseId}`);
    const name = (u: string) => new URL(u).pathname.split('/').pop()!;
    expect([...review].map(name).some((n) => n.startsWith('SignoffPanel.'))).toBe(true);
    expect([...review].map(name).some((n) => n.startsWith('Discussion.'))).toBe(true);
    const shared = [...review].filter((u) => chairside.has(u)).map(name);
    // Astro's React renderer (client), React (react) and the uuid package's own chunk (v4),
    // which the chairside loads anyway: nothing of ours moves into a chunk the tablet loads.
    expect(shared.map((n) => n.split('.')[0]).sort()).toEqual(['client', 'react', 'v4']);
  });
});

describe('on a phone', () => {
  it('fits 390 px: no sideways scrolling, the navigator and the sign-off panel reachable', async () => {
    const { context, page } = await session(DEMO.helen, 390, 844);
    await open(page, `/cases/${molar.caseId}`);
    const width = await page.evaluate(() => document.documentElement.scrollWidth);
    expect(width).toBeLessThanOrEqual(390);
    await navLink(page, /MB canal/).click();
    await expect(panel(page, mb).isVisible()).resolves.toBe(true);
    await expect(page.getByTestId('signoff-panel').count()).resolves.toBe(1);
    expect(await violations(page)).toEqual([]);
    await page.screenshot({ path: 'test-results/review-page-phone.png', fullPage: true });
    await context.close();
  });
});
