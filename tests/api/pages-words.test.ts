// The built server's pages show words, never the codes the rules and the database keep, and
// show dates in the clinic's zone. Auckland is 12–13 h ahead of UTC, so an evening UTC instant
// falls on the next day there: a page that sliced the UTC string would show the wrong date.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { EVENT_TYPES, FILL_LENGTHS, RADIOGRAPH_PURPOSES, SEALERS, SOLUTIONS } from '../../src/lib/rules/core';
import { SEVERITY } from '../../src/lib/rules/severities';
import { CANAL_STATUS_LABEL, formatInstant } from '../../src/lib/present';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';

const clinic = { timeZone: 'Pacific/Auckland', locale: 'en-GB' };
let server: TestServer;
let helen: ApiClient;
let ingrid: ApiClient;

beforeAll(async () => {
  server = await startServer({ env: { CLINIC_TIME_ZONE: clinic.timeZone, CLINIC_LOCALE: clinic.locale } });
  helen = await apiSignIn(server.baseUrl, DEMO.helen, DEMO.password);
  ingrid = await apiSignIn(server.baseUrl, DEMO.ingrid, DEMO.password);
});
afterAll(async () => {
  await server?.stop();
});

/** The text a reader sees: no scripts, styles or tags (attributes such as data-code are not shown). */
function visibleText(html: string): string {
  return html
    .replace(/<script[\s\S]*?<\/script>/g, ' ')
    .replace(/<style[\s\S]*?<\/style>/g, ' ')
    .replace(/<[^>]+>/g, ' ')
    .replace(/&[a-z#0-9]+;/g, ' ');
}

const CODES = [
  ...Object.keys(SEVERITY),
  ...EVENT_TYPES,
  ...RADIOGRAPH_PURPOSES,
  ...SEALERS.filter((s) => s.includes('-')),
  ...FILL_LENGTHS.filter((s) => s.includes('-')),
  ...SOLUTIONS.filter((s) => s !== 'saline'), // "saline" is also its own label
  ...Object.keys(CANAL_STATUS_LABEL).filter((s) => s.includes('-')),
];
/** Each code found as a whole token in `text` (a hyphen or dot continues a token). */
function rawCodesIn(text: string): string[] {
  return CODES.filter((c) => new RegExp(`(?<![\\w.-])${c.replace(/\./g, '\\.')}(?![\\w-]|\\.\\w)`).test(text));
}

async function page(api: ApiClient, path: string): Promise<string> {
  const res = await api.fetch(path);
  expect(res.status, path).toBe(200);
  return res.text();
}

describe('GET /api/me', () => {
  it('reports the clinic’s time zone and locale beside the user', async () => {
    const me = (await (await helen.fetch('/api/me')).json()) as Record<string, unknown>;
    expect(me).toMatchObject({ email: DEMO.helen, role: 'attending', clinic });
  });
});

describe('the case page', () => {
  it('shows no raw finding code, event type or other stored code, and dates in the clinic’s zone', async () => {
    const { cases } = (await (await helen.fetch('/api/cases')).json()) as {
      cases: { caseId: string; openedAt: string }[];
    };
    expect(cases.length).toBeGreaterThan(0);
    for (const c of cases) {
      const text = visibleText(await page(helen, `/cases/${c.caseId}`));
      expect(rawCodesIn(text), c.caseId).toEqual([]);
      expect(text).toContain(`opened ${formatInstant(c.openedAt, clinic, 'date')}`);
    }
  });
});

describe('the home pages', () => {
  it('shows the director the findings seen most by title, not by code', async () => {
    const text = visibleText(await page(ingrid, '/'));
    expect(text).toContain('Open findings seen most');
    expect(rawCodesIn(text)).toEqual([]);
  });

  it('shows the attending’s case lists in words, dated in the clinic’s zone', async () => {
    const text = visibleText(await page(helen, '/'));
    expect(rawCodesIn(text)).toEqual([]);
    const { cases } = (await (await helen.fetch('/api/cases')).json()) as { cases: { openedAt: string }[] };
    expect(text).toContain(formatInstant(cases[0]!.openedAt, clinic, 'date'));
  });

  it('shows the review queue in words, dated in the clinic’s zone, rendered on the server', async () => {
    const text = visibleText(await page(helen, '/review'));
    expect(rawCodesIn(text)).toEqual([]);
    const { rows } = (await (await helen.fetch('/api/review/queue')).json()) as { rows: { since: { at: string } }[] };
    expect(rows.length).toBeGreaterThan(0);
    expect(text).toContain(formatInstant(rows[0]!.since.at, clinic));
    expect(text).not.toContain('needs-action');
  });

  it('would notice a raw code in the text', () => {
    expect(rawCodesIn('Radiograph taken (maf) · compaction-incomplete')).toEqual(['compaction-incomplete', 'maf']);
  });
});
