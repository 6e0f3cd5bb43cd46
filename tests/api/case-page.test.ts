// The case page as a reader sees it: the tooth named once with its Universal number, canals
// named once, and what was withdrawn or taken out of a canal, with the reason given.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { EventWriter } from '../helpers/events';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let priya: ApiClient;
const as: Record<string, ApiClient> = {};
beforeAll(async () => {
  server = await startServer();
  priya = await apiSignIn(server.baseUrl, DEMO.priya, DEMO.password);
  for (const who of ['tomas', 'helen', 'samuel', 'ingrid'] as const)
    as[who] = await apiSignIn(server.baseUrl, DEMO[who], DEMO.password);
});
afterAll(async () => {
  await server?.stop();
});

/** The page's text without tags, scripts or styles, its spaces collapsed. */
function visibleText(html: string): string {
  return html
    .replace(/<script[\s\S]*?<\/script>/g, ' ')
    .replace(/<style[\s\S]*?<\/style>/g, ' ')
    .replace(/<[^>]+>/g, ' ')
    .replace(/&[a-z#0-9]+;/g, ' ')
    .replace(/\s+/g, ' ');
}

describe('the case page', () => {
  it('names the tooth with its Universal number and a canal once, and says what was withdrawn and why', async () => {
    // Invented case: tooth 36, distal canal; a taper check withdrawn, a short cone removed.
    const w = new EventWriter();
    w.open('extracted', 36);
    const d = w.canal('D', 20.5);
    const main = w.canal('Main', 19);
    w.add('seat.checked', { fileSize: '35', lengthMm: 20.5, result: 'seated' }, d);
    const taper = w.add('taper.checked', { spreader: 'MF', depthMm: 18 }, d);
    w.add('event.voided', { eventId: taper.id, reason: 'Spreader read at the wrong mark' }, d);
    w.add('taper.checked', { spreader: 'MF', depthMm: 19.5 }, d);
    const short = w.add('accessory.placed', { size: 'F', lengthMm: 15, reachedLength: false }, d);
    w.add('accessory.removed', { eventId: short.id, reason: 'Stopped short of the spreader depth' }, d);
    w.add('gp.seared', { atOrifice: true, relativeToCejMm: -0.5 }, main);
    const res = await priya.post('/api/sync', { deviceId: 'tablet-case-page', events: w.events });
    expect(res.status).toBe(200);

    const html = await (await priya.fetch(`/cases/${w.caseId}`)).text();
    const h1 = visibleText(/<h1[\s\S]*?<\/h1>/.exec(html)![0]).trim();
    expect(h1).toMatch(/^Tooth 36 \(Universal 19\) · /);
    const text = visibleText(html);
    expect(text).not.toMatch(/\bcanal\s+(canal|main)\b|\d\(U\b|\bU 19\b/i);
    expect(text).toContain('Main canal');
    expect(text).toContain('Withdrawn and removed');
    expect(text).toContain('Taper check, spreader MF: 18.0 mm — withdrawn: Spreader read at the wrong mark');
    expect(text).toContain('Accessory cone F: 15.0 mm, stopped short — removed: Stopped short of the spreader depth');
    expect(text).toContain('Seared at the orifice, 0.5 mm above the CEJ');
  });
});

describe('the case page as the review page', () => {
  /** Priya's demo cases: a premolar signed off by Dr Osei, a training block he returned. */
  async function priyasCases() {
    const { cases } = (await (await priya.fetch('/api/cases')).json()) as {
      cases: { caseId: string; tooth: number | null; reviewStatus: string }[];
    };
    return {
      premolar: cases.find((c) => c.tooth === 14)!.caseId,
      block: cases.find((c) => c.reviewStatus === 'returned')!.caseId,
    };
  }
  const page = async (who: ApiClient, path: string) => {
    const res = await who.fetch(path);
    return { status: res.status, html: await res.text() };
  };

  it('offers the sign-off panel to the assigned attending and a director, not to the student, and 404 to the others', async () => {
    const { premolar } = await priyasCases();
    for (const who of [as.samuel!, as.ingrid!]) {
      const p = await page(who, `/cases/${premolar}`);
      expect(p.status).toBe(200);
      expect(p.html).toContain('data-testid="signoff-panel"');
    }
    const own = await page(priya, `/cases/${premolar}`);
    expect(own.status).toBe(200);
    expect(own.html).not.toContain('data-testid="signoff-panel"');
    // The student sees every sign-off and may comment.
    expect(visibleText(own.html)).toContain('Whole case: approved — Dr Samuel Osei');
    expect(own.html).toContain('Your comment on the case');
    for (const who of [as.helen!, as.tomas!]) expect((await page(who, `/cases/${premolar}`)).status).toBe(404);
  });

  it("tells the student on the home page what came back and who returned it, and shows no one else's sign-offs", async () => {
    const { block } = await priyasCases();
    const home = visibleText((await page(priya, '/')).html);
    expect(home).toMatch(
      /Came back to you ↩ Came back Training block — returned by Dr Samuel Osei, .* The taper check stopped 2\.5 mm short/,
    );
    expect(home).toContain('Latest sign-offs');
    expect((await page(priya, '/')).html).toContain(`href="/cases/${block}"`);
    const tomas = visibleText((await page(as.tomas!, '/')).html);
    expect(tomas).not.toContain('Came back');
    expect(tomas).not.toContain('Dr Samuel Osei');
  });

  it('takes no comment on a discarded case, and offers none', async () => {
    const w = new EventWriter();
    w.open('block');
    w.add('case.discarded', { reason: 'Opened by mistake' });
    expect((await priya.post('/api/sync', { deviceId: 'tablet-case-page', events: w.events })).status).toBe(200);
    const own = await page(priya, `/cases/${w.caseId}`);
    expect(own.status).toBe(200);
    expect(own.html).not.toContain('Your comment on');
    const samuel = await page(as.samuel!, `/cases/${w.caseId}`);
    expect(visibleText(samuel.html)).toContain('This case was discarded: there is nothing to sign off.');
  });
});
