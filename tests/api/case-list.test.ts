// The case list (GET /api/cases with a query, and the /cases page): each filter gives exactly
// the cases of the whole list that match it, dates are days in the clinic's zone (Auckland
// here, 13 h ahead of UTC in December), pages follow each other without a gap or a repeat,
// attendings see their students' cases only, students get 403 on the page, and a filter that
// does not read is answered 400 naming it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CaseListAnswer, CaseSummary } from '../../src/lib/contract';
import { addAccount, idOf, send } from '../helpers/admin';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';

const ZONE = 'Pacific/Auckland';
let server: TestServer;
let ingrid: ApiClient;
let helen: ApiClient;
let mira: ApiClient;
let all: CaseSummary[];
const id: Record<string, number> = {};

beforeAll(async () => {
  server = await startServer({ env: { CLINIC_TIME_ZONE: ZONE } });
  ingrid = await apiSignIn(server.baseUrl, DEMO.ingrid, DEMO.password);
  helen = await apiSignIn(server.baseUrl, DEMO.helen, DEMO.password);
  mira = await apiSignIn(server.baseUrl, DEMO.mira, DEMO.password);
  for (const who of ['mira', 'tomas', 'priya', 'helen', 'samuel'] as const) id[who] = await idOf(server, DEMO[who]);
  all = (await list(ingrid, '')).cases;
});
afterAll(async () => {
  await server?.stop();
});

async function list(api: ApiClient, query: string): Promise<CaseListAnswer> {
  const res = await api.fetch(`/api/cases${query ? `?${query}` : ''}`);
  expect(res.status, query).toBe(200);
  return (await res.json()) as CaseListAnswer;
}
const idsOf = (cases: CaseSummary[]) => cases.map((c) => c.caseId);
/** The day an instant falls on in the clinic's zone, YYYY-MM-DD. */
const clinicDay = (iso: string) => new Intl.DateTimeFormat('en-CA', { timeZone: ZONE }).format(new Date(iso));
/** FDI groups as the issue states them: anterior x1–x3, premolar x4–x5 (permanent), molar the rest. */
function group(tooth: number | null): string | null {
  if (tooth === null) return null;
  const t = tooth % 10;
  if (t <= 3) return 'anterior';
  return t <= 5 && tooth < 50 ? 'premolar' : 'molar';
}

describe('GET /api/cases with filters', () => {
  it('lists every case to a director with no query, as before, and no next page', async () => {
    const body = await list(ingrid, '');
    expect(body.nextCursor).toBeNull();
    expect(new Set(body.cases.map((c) => c.studentName))).toEqual(
      new Set(['Mira Okafor', 'Tomas Lindqvist', 'Priya Raman']),
    );
    expect(all.length).toBeGreaterThanOrEqual(5);
  });

  it('filters by student, by attending and by cohort', async () => {
    expect(idsOf((await list(ingrid, `student=${id.priya}`)).cases)).toEqual(
      idsOf(all.filter((c) => c.studentId === id.priya)),
    );
    // Samuel reviews Tomas and Priya.
    expect(idsOf((await list(ingrid, `attending=${id.samuel}`)).cases)).toEqual(
      idsOf(all.filter((c) => c.studentId === id.tomas || c.studentId === id.priya)),
    );
    const made = await send(ingrid, 'POST', '/api/cohorts', { name: 'Filter cohort' });
    const cohortId = (made.body.cohort as { cohortId: number }).cohortId;
    expect((await list(ingrid, `cohort=${cohortId}`)).cases).toEqual([]);
    expect((await send(ingrid, 'POST', `/api/users/${id.tomas}/cohort`, { cohortId })).status).toBe(200);
    expect(idsOf((await list(ingrid, `cohort=${cohortId}`)).cases)).toEqual(
      idsOf(all.filter((c) => c.studentId === id.tomas)),
    );
  });

  it('filters by state', async () => {
    const seen = new Set<string>();
    for (const state of ['open', 'submitted', 'returned', 'approved']) {
      const got = (await list(ingrid, `state=${state}`)).cases;
      expect(idsOf(got), state).toEqual(idsOf(all.filter((c) => c.reviewStatus === state)));
      for (const c of got) seen.add(c.reviewStatus);
    }
    // The demo has cases in more than one state, so the filter is seen to choose.
    expect(seen.size).toBeGreaterThanOrEqual(3);
  });

  it('filters by tooth group (training blocks are in none)', async () => {
    const groups = new Set<string>();
    for (const g of ['anterior', 'premolar', 'molar']) {
      const got = (await list(ingrid, `toothGroup=${g}`)).cases;
      expect(idsOf(got), g).toEqual(idsOf(all.filter((c) => group(c.tooth) === g)));
      if (got.length) groups.add(g);
    }
    expect(groups).toEqual(new Set(['anterior', 'premolar', 'molar']));
  });

  it('filters by the day a case was opened, in the clinic’s time zone', async () => {
    // Mira's molar was opened 2026-11-30T13:10Z: 1 December in Auckland.
    const molar = all.find((c) => c.tooth === 36)!;
    expect(clinicDay(molar.openedAt)).toBe('2026-12-01');
    const onFirst = (await list(ingrid, 'openedFrom=2026-12-01&openedTo=2026-12-01')).cases;
    expect(idsOf(onFirst)).toContain(molar.caseId);
    expect(idsOf(onFirst)).toEqual(idsOf(all.filter((c) => clinicDay(c.openedAt) === '2026-12-01')));
    expect(idsOf((await list(ingrid, 'openedTo=2026-11-30')).cases)).not.toContain(molar.caseId);
    const from = '2026-11-16';
    expect(idsOf((await list(ingrid, `openedFrom=${from}`)).cases)).toEqual(
      idsOf(all.filter((c) => clinicDay(c.openedAt) >= from)),
    );
  });

  it('filters by the day a case was submitted, leaving out cases never submitted', async () => {
    const submitted = all.filter((c) => c.submittedAt !== null);
    expect(submitted.length).toBeGreaterThan(0);
    const day = clinicDay(submitted[0]!.submittedAt!);
    expect(idsOf((await list(ingrid, `submittedFrom=${day}&submittedTo=${day}`)).cases)).toEqual(
      idsOf(submitted.filter((c) => clinicDay(c.submittedAt!) === day)),
    );
    expect((await list(ingrid, 'submittedFrom=2030-01-01')).cases).toEqual([]);
  });

  it('combines filters', async () => {
    expect(idsOf((await list(ingrid, `student=${id.priya}&state=approved`)).cases)).toEqual(
      idsOf(all.filter((c) => c.studentId === id.priya && c.reviewStatus === 'approved')),
    );
  });

  it('pages through every case with a cursor, in the same order, with no repeat', async () => {
    const seen: string[] = [];
    let cursor: string | null = null;
    let pages = 0;
    do {
      const page: CaseListAnswer = await list(
        ingrid,
        `limit=2${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ''}`,
      );
      expect(page.cases.length).toBeLessThanOrEqual(2);
      seen.push(...idsOf(page.cases));
      cursor = page.nextCursor;
      pages++;
    } while (cursor && pages < 20);
    expect(seen).toEqual(idsOf(all));
    expect(pages).toBe(Math.ceil(all.length / 2));
  });

  it('keeps an attending to their own students’ cases, whatever the filters', async () => {
    const mine = (await list(helen, '')).cases;
    expect(new Set(mine.map((c) => c.studentId))).toEqual(new Set([id.mira, id.tomas]));
    expect((await list(helen, `student=${id.priya}`)).cases).toEqual([]);
    expect(idsOf((await list(helen, 'state=submitted')).cases)).toEqual(
      idsOf(mine.filter((c) => c.reviewStatus === 'submitted')),
    );
  });

  it('keeps a student to their own cases, as the tablet has always read them', async () => {
    const own = await list(mira, '');
    expect(new Set(own.cases.map((c) => c.studentId))).toEqual(new Set([id.mira]));
    expect(own.nextCursor).toBeNull();
    expect((await list(mira, `student=${id.priya}`)).cases).toEqual([]);
  });

  it('answers 400 naming the parameter that does not read', async () => {
    for (const [query, field] of [
      ['state=discarded', 'state'],
      ['toothGroup=canine', 'toothGroup'],
      ['openedFrom=2026-02-30', 'openedFrom'],
      ['openedFrom=2026-12-02&openedTo=2026-12-01', 'openedTo'],
      ['student=mira', 'student'],
      ['student=1&student=2', 'student'],
      ['limit=0', 'limit'],
      ['limit=201', 'limit'],
      ['cursor=not-one-of-ours', 'cursor'],
    ]) {
      const res = await ingrid.fetch(`/api/cases?${query}`);
      expect(res.status, query).toBe(400);
      expect(((await res.json()) as { field?: string }).field, query).toBe(field);
    }
    expect((await ingrid.fetch('/api/cases?colour=blue')).status).toBe(400);
  });
});

describe('the /cases page', () => {
  it('renders the filtered list on the server from a plain GET form, each row opening its case', async () => {
    const res = await ingrid.fetch('/cases?state=submitted');
    expect(res.status).toBe(200);
    const html = await res.text();
    expect(html).toMatch(/<form[^>]*method="get"[^>]*action="\/cases"/);
    const submitted = all.filter((c) => c.reviewStatus === 'submitted');
    expect(submitted.length).toBeGreaterThan(0);
    for (const c of all) {
      if (c.reviewStatus === 'submitted') expect(html).toContain(`href="/cases/${c.caseId}"`);
      else expect(html).not.toContain(`href="/cases/${c.caseId}"`);
    }
    expect(html).toMatch(/<option value="submitted" selected/);
  });

  it('shows an attending their students’ cases and no attending filter', async () => {
    const html = await (await helen.fetch('/cases')).text();
    for (const c of all) {
      const theirs = c.studentId === id.mira || c.studentId === id.tomas;
      expect(html.includes(`href="/cases/${c.caseId}"`), c.studentName).toBe(theirs);
    }
    expect(html).not.toContain('name="attending"');
  });

  it('says beside the field what is wrong with a filter, with a 400', async () => {
    const res = await ingrid.fetch('/cases?openedFrom=2026-12-02&openedTo=2026-12-01');
    expect(res.status).toBe(400);
    const html = await res.text();
    expect(html).toMatch(/id="f-openedTo"[^>]*aria-invalid="true"|aria-invalid="true"[^>]*id="f-openedTo"/);
    expect(html).toContain('id="f-openedTo-error"');
    expect(html).toContain('“Opened until” must not be before “Opened from”');
  });

  it('is refused to students (403) and offered from the attending’s and the director’s home pages', async () => {
    expect((await mira.fetch('/cases')).status).toBe(403);
    for (const api of [ingrid, helen]) expect(await (await api.fetch('/')).text()).toContain('href="/cases"');
    // A student made after the list was read is not shown to Helen: the pickers follow assignments.
    await addAccount(server, 'new.student@larkfield.example', 'student', { name: 'Newly Enrolled' });
    expect(await (await helen.fetch('/cases')).text()).not.toContain('Newly Enrolled');
    expect(await (await ingrid.fetch('/cases')).text()).toContain('Newly Enrolled');
  });
});
