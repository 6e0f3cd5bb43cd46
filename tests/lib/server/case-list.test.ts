// The case list's pure parts: a clinic day's first instant in the clinic's zone (across clock
// changes), the tooth groups by FDI number, and the query schema the API and the page share.
import { describe, expect, it } from 'vitest';
import { CASE_LIST_PARAMS, caseListQuerySchema, queryObject, TOOTH_GROUPS } from '../../../src/lib/contract-case-list';
import { dayStart } from '../../../src/lib/server/case-list';
import { teethOf } from '../../../src/lib/server/review-queue';
import { isValidFdi } from '../../../src/lib/rules/index';

describe('dayStart', () => {
  it('gives midnight in the clinic’s zone as a UTC instant', () => {
    expect(dayStart('2026-12-01', 'UTC')).toBe('2026-12-01T00:00:00.000Z');
    expect(dayStart('2026-12-01', 'Pacific/Auckland')).toBe('2026-11-30T11:00:00.000Z'); // NZDT, +13
    expect(dayStart('2026-07-01', 'Pacific/Auckland')).toBe('2026-06-30T12:00:00.000Z'); // NZST, +12
    expect(dayStart('2026-12-01', 'America/New_York')).toBe('2026-12-01T05:00:00.000Z');
  });

  it('counts days on, and holds across a clock change', () => {
    expect(dayStart('2026-12-31', 'UTC', 1)).toBe('2027-01-01T00:00:00.000Z');
    // London goes to summer time at 01:00 UTC on 29 March 2026: that day starts in GMT, the next in BST.
    expect(dayStart('2026-03-29', 'Europe/London')).toBe('2026-03-29T00:00:00.000Z');
    expect(dayStart('2026-03-29', 'Europe/London', 1)).toBe('2026-03-29T23:00:00.000Z');
    // And back on 25 October 2026.
    expect(dayStart('2026-10-25', 'Europe/London')).toBe('2026-10-24T23:00:00.000Z');
    expect(dayStart('2026-10-25', 'Europe/London', 1)).toBe('2026-10-26T00:00:00.000Z');
  });
});

describe('the tooth groups the case list filters by', () => {
  it('put x1–x3 in anterior, permanent x4–x5 in premolar and the rest, primary molars too, in molar', () => {
    const all = Array.from({ length: 100 }, (_, i) => i).filter(isValidFdi);
    const grouped = new Map(TOOTH_GROUPS.flatMap((g) => teethOf(g).map((n) => [n, g] as const)));
    for (const n of all) {
      const t = n % 10;
      const want = t <= 3 ? 'anterior' : t <= 5 && n < 50 ? 'premolar' : 'molar';
      expect(grouped.get(n), String(n)).toBe(want);
    }
    expect(grouped.size).toBe(all.length);
  });
});

describe('caseListQuerySchema', () => {
  const parse = (q: string) => caseListQuerySchema.safeParse(queryObject(new URLSearchParams(q)));

  it('reads ids, states, groups, days and paging, and drops empty values', () => {
    const r = parse('cohort=3&student=&state=submitted&toothGroup=molar&openedFrom=2026-11-01&limit=20');
    expect(r.success && r.data).toEqual({
      cohort: 3,
      state: 'submitted',
      toothGroup: 'molar',
      openedFrom: '2026-11-01',
      limit: 20,
    });
  });

  it('refuses, naming the parameter, what does not read', () => {
    for (const [q, path] of [
      ['cohort=0', 'cohort'],
      ['attending=abc', 'attending'],
      ['submittedTo=2026-13-01', 'submittedTo'],
      ['submittedFrom=2026-11-02&submittedTo=2026-11-01', 'submittedTo'],
      ['state=open&state=approved', 'state'],
      ['limit=500', 'limit'],
    ]) {
      const r = parse(q!);
      expect(r.success, q).toBe(false);
      if (!r.success) expect(r.error.issues[0]?.path[0], q).toBe(path);
    }
    expect(parse('sort=name').success).toBe(false);
  });

  it('lists the parameters the docs list', () => {
    expect([...CASE_LIST_PARAMS].sort()).toEqual(
      [
        'attending',
        'cohort',
        'cursor',
        'limit',
        'openedFrom',
        'openedTo',
        'state',
        'student',
        'submittedFrom',
        'submittedTo',
        'toothGroup',
      ].sort(),
    );
  });
});
