// The audit log through the built server (docs/settings.md, "The audit log"): filters, paging
// behind a cursor, the page in the clinic's zone, the CSV with formulas neutralised, and
// directors only.
import { randomUUID } from 'node:crypto';
import Database from 'better-sqlite3';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AUDIT_CSV_COLUMNS, type AuditEntry } from '../../src/lib/server/audit-log';
import { formatInstant } from '../../src/lib/present/format';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';

// A zone far from UTC, so a time shown in UTC by mistake cannot pass for the clinic's.
const CLINIC = { timeZone: 'Pacific/Auckland', locale: 'en-GB' };
let server: TestServer;
const as: Record<'mira' | 'helen' | 'ingrid', ApiClient> = {} as never;
const ids: Record<'mira' | 'ingrid', number> = { mira: 0, ingrid: 0 };

const setting = async (values: Record<string, number>) => {
  const { version } = (await (await as.ingrid.fetch('/api/settings')).json()) as { version: number };
  const res = await as.ingrid.post(
    '/api/settings',
    { id: randomUUID(), values },
    { method: 'PUT', headers: { 'If-Match': `"${version}"` } },
  );
  expect(res.status).toBe(200);
};

beforeAll(async () => {
  server = await startServer({ env: { CLINIC_TIME_ZONE: CLINIC.timeZone, CLINIC_LOCALE: CLINIC.locale } });
  for (const who of ['mira', 'helen', 'ingrid'] as const)
    as[who] = await apiSignIn(server.baseUrl, DEMO[who], DEMO.password);
  for (const who of ['mira', 'ingrid'] as const)
    ids[who] = ((await (await as[who].fetch('/api/me')).json()) as { id: number }).id;
  // Lines of our own: two settings changes by the director, a preference of the student's.
  await setting({ minAccessoryCones: 4 });
  await setting({ minAccessoryCones: 3 });
  expect((await as.mira.post('/api/me/mail', { id: randomUUID(), digest: true })).status).toBe(200);
  // And lines a spreadsheet would run as formulas, written where only the database can.
  const db = new Database(server.dbFile);
  const insert = db.prepare(
    'insert into audit_log (at, actor_id, action, subject_type, subject_id, detail_json) values (?, null, ?, ?, ?, null)',
  );
  insert.run(new Date().toISOString(), '@SUM(A1)', '+cmd', '=HYPERLINK("http://example.invalid","x")');
  insert.run(new Date().toISOString(), 'test.formula', 'case', '-2+3');
  db.close();
});
afterAll(async () => {
  await server?.stop();
});

const page = async (query: string, who: ApiClient = as.ingrid) => {
  const res = await who.fetch(`/api/audit${query ? `?${query}` : ''}`);
  return {
    status: res.status,
    body: (await res.json()) as { entries: AuditEntry[]; nextCursor: number | null; field?: string },
  };
};
/** Today in the clinic's zone, YYYY-MM-DD. */
const today = () => new Intl.DateTimeFormat('en-CA', { timeZone: CLINIC.timeZone }).format(new Date());

describe('GET /api/audit', () => {
  it('filters by actor, by action and by subject, each line matching', async () => {
    const byActor = (await page(`actor=${ids.ingrid}&limit=200`)).body.entries;
    expect(byActor.length).toBeGreaterThanOrEqual(2);
    expect(byActor.every((e) => e.actorId === ids.ingrid && e.actorName === 'Dr Ingrid Holm')).toBe(true);

    const changes = (await page('action=settings.change')).body.entries;
    expect(changes).toHaveLength(2);
    expect(
      changes.every((e) => e.action === 'settings.change' && e.actionWords === 'Changed the course settings'),
    ).toBe(true);
    expect(changes[0]!.detail).toMatchObject({ changes: { minAccessoryCones: { from: 4, to: 3 } } });
    expect(changes[0]!.detailText).toBe('minAccessoryCones: 4 → 3');

    const mine = (await page(`subjectType=user&subjectId=${ids.mira}`)).body.entries;
    expect(mine.map((e) => e.action)).toContain('user.mail-preference');
    expect(mine.every((e) => e.subjectType === 'user' && e.subjectId === String(ids.mira))).toBe(true);
    expect(mine[0]!.subjectName).toBe('Mira Okafor');
  });

  it('takes a range of days in the clinic’s zone, both ends included', async () => {
    const all = (await page('limit=200')).body.entries;
    const todays = (await page(`from=${today()}&to=${today()}&limit=200`)).body.entries;
    expect(todays.map((e) => e.id)).toEqual(
      all
        .filter(
          (e) => new Intl.DateTimeFormat('en-CA', { timeZone: CLINIC.timeZone }).format(new Date(e.at)) === today(),
        )
        .map((e) => e.id),
    );
    expect(todays.length).toBeGreaterThanOrEqual(5);
    expect((await page('from=2001-01-01&to=2001-01-02')).body.entries).toEqual([]);
  });

  it('refuses a bad filter with 400 naming it', async () => {
    for (const [query, field] of [
      ['from=2026-02-30', 'from'],
      ['to=yesterday', 'to'],
      ['from=2026-12-05&to=2026-12-01', 'from'],
      ['actor=me', 'actor'],
      ['limit=500', 'limit'],
      ['cursor=-1', 'cursor'],
      ['colour=red', 'colour'],
    ]) {
      const r = await page(query!);
      expect(r.status, query).toBe(400);
      expect(r.body.field, query).toBe(field);
    }
  });

  it('pages newest first behind a cursor, every line once', async () => {
    const all = (await page('limit=200')).body;
    expect(all.nextCursor).toBeNull();
    const seen: number[] = [];
    let cursor: number | null = null;
    do {
      const r = await page(`limit=3${cursor === null ? '' : `&cursor=${cursor}`}`);
      expect(r.body.entries.length).toBeLessThanOrEqual(3);
      seen.push(...r.body.entries.map((e) => e.id));
      cursor = r.body.nextCursor;
    } while (cursor !== null);
    expect(seen).toEqual(all.entries.map((e) => e.id));
    expect([...seen].sort((a, b) => b - a)).toEqual(seen);
  });

  it('is for directors only', async () => {
    for (const who of [as.mira, as.helen]) {
      expect((await page('', who)).status).toBe(403);
      expect((await who.fetch('/api/audit.csv')).status).toBe(403);
      expect((await who.fetch('/admin/audit')).status).toBe(403);
    }
  });
});

describe('GET /api/audit.csv', () => {
  it('sends the lines the filters choose as CSV with a safe file name', async () => {
    const res = await as.ingrid.fetch('/api/audit.csv?action=settings.change');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('text/csv; charset=utf-8');
    expect(res.headers.get('content-disposition')).toBe(`attachment; filename="coneline-audit-${today()}.csv"`);
    const parsed = Papa.parse<Record<string, string>>(await res.text(), { header: true, skipEmptyLines: true });
    expect(parsed.meta.fields).toEqual([...AUDIT_CSV_COLUMNS]);
    const json = (await page('action=settings.change')).body.entries;
    expect(parsed.data.map((r) => Number(r.id))).toEqual(json.map((e) => e.id));
    const [row] = parsed.data;
    expect(row).toMatchObject({
      at_utc: json[0]!.at,
      at_clinic: formatInstant(json[0]!.at, CLINIC),
      actor_id: String(ids.ingrid),
      actor: 'Dr Ingrid Holm',
      action: 'settings.change',
      action_words: 'Changed the course settings',
      subject_type: 'settings',
    });
    expect(JSON.parse(row!.detail!)).toEqual(json[0]!.detail);
  });

  it('neutralises cells a spreadsheet would run as a formula', async () => {
    const text = await (await as.ingrid.fetch('/api/audit.csv')).text();
    const rows = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true }).data;
    const formula = rows.find((r) => r.subject_type === "'+cmd")!;
    expect(formula).toMatchObject({
      action: "'@SUM(A1)",
      action_words: "'@SUM(A1)",
      subject_id: `'=HYPERLINK("http://example.invalid","x")`,
      actor: 'system',
    });
    expect(rows.find((r) => r.action === 'test.formula')!.subject_id).toBe("'-2+3");
    // Nothing else begins like a formula.
    for (const r of rows) for (const v of Object.values(r)) expect(v, JSON.stringify(r)).not.toMatch(/^[=+\-@]/);
  });
});

describe('/admin/audit', () => {
  it('shows the filtered lines in words, times in the clinic’s zone, and works as a plain GET form', async () => {
    const res = await as.ingrid.fetch(`/admin/audit?action=settings.change&actor=${ids.ingrid}`);
    expect(res.status).toBe(200);
    const html = await res.text();
    const [latest] = (await page('action=settings.change')).body.entries;
    expect(html).toContain('Changed the course settings');
    expect(html).toContain(`<time datetime="${latest!.at}">${formatInstant(latest!.at, CLINIC)}</time>`);
    expect(html).toContain('minAccessoryCones: 4 → 3');
    expect(html).toMatch(/<form method="get" action="\/admin\/audit"/);
    // The export keeps the filters (an ampersand in an attribute may be written either way).
    expect(html).toMatch(
      new RegExp(`href="/api/audit\\.csv\\?actor=${ids.ingrid}&(?:amp;|#38;)?action=settings\\.change"`),
    );
  });

  it('answers a bad filter with 400 and says why beside the field', async () => {
    const res = await as.ingrid.fetch('/admin/audit?from=2026-13-01');
    expect(res.status).toBe(400);
    const html = await res.text();
    expect(html).toMatch(/id="from-error"[^>]*>from must be a day written YYYY-MM-DD</);
  });
});
