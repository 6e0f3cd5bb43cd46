// GET /api/review/queue through the built server (docs/review.md, "The queue"): who may read
// it, whose cases each attending sees, every filter, order and page, and the pending cone-fit
// rule. Fixture cases and the cone-fit events are written straight into the server's SQLite
// file (tests/helpers/queue-db.ts): sync does not take the cone-fit event types yet.
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { QueueAnswer, QueueRow } from '../../src/lib/contract';
import { anonymous, apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { EventWriter } from '../helpers/events';
import { addCase, addEvent, addStudent, openDb, userId } from '../helpers/queue-db';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let k: Knex;
const as: Record<string, ApiClient> = {};
const ids: Record<string, number> = {};

beforeAll(async () => {
  server = await startServer();
  k = openDb(server.dbFile);
  for (const who of ['mira', 'tomas', 'priya', 'helen', 'samuel', 'ingrid'] as const) {
    as[who] = await apiSignIn(server.baseUrl, DEMO[who], DEMO.password);
    ids[who] = await userId(k, DEMO[who]);
  }
});
afterAll(async () => {
  await k?.destroy();
  await server?.stop();
});

async function queue(who: string, query = ''): Promise<{ status: number; body: QueueAnswer & { field?: string } }> {
  const res = await as[who]!.fetch(`/api/review/queue${query ? `?${query}` : ''}`);
  return { status: res.status, body: (await res.json()) as QueueAnswer & { field?: string } };
}
async function rows(who: string, query = ''): Promise<QueueRow[]> {
  const res = await queue(who, query);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body.rows;
}
/** Every page, following nextCursor; checks each page holds at most 50 rows. */
async function allPages(who: string, query: string, between?: (page: number) => Promise<void>): Promise<QueueRow[]> {
  const out: QueueRow[] = [];
  let cursor: string | null = null;
  for (let page = 0; page < 20; page++) {
    const res = await queue(who, `${query}${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ''}`);
    expect(res.status).toBe(200);
    expect(res.body.rows.length).toBeLessThanOrEqual(50);
    out.push(...res.body.rows);
    cursor = res.body.nextCursor;
    if (!cursor) return out;
    await between?.(page);
  }
  throw new Error('too many pages');
}
const caseIds = (list: QueueRow[]) => list.map((r) => r.caseId);

describe('who may read the queue', () => {
  it('answers 401 to no session, 403 to a student, and 200 to attendings and the director', async () => {
    expect((await anonymous(server.baseUrl).fetch('/api/review/queue')).status).toBe(401);
    expect((await queue('mira')).status).toBe(403);
    for (const who of ['helen', 'samuel', 'ingrid']) expect((await queue(who)).status).toBe(200);
  });

  it("shows an attending only their assigned students' cases, and the director every case", async () => {
    const helens = caseIds(await rows('helen', 'state=all'));
    const samuels = caseIds(await rows('samuel', 'state=all'));
    const everyone = caseIds(await rows('ingrid', 'state=all'));
    const of = async (who: string) =>
      (await k('cases').where({ student_id: ids[who] }).whereNull('discarded_at').pluck('id')) as string[];
    const [mira, tomas, priya] = [await of('mira'), await of('tomas'), await of('priya')];
    expect(helens.sort()).toEqual([...mira, ...tomas].sort());
    expect(samuels.sort()).toEqual([...tomas, ...priya].sort());
    expect(everyone).toEqual(expect.arrayContaining([...mira, ...tomas, ...priya]));
    // Filtering by a student who is not theirs shows nothing, not an error.
    expect(await rows('helen', `state=all&student=${ids.priya}`)).toEqual([]);
  });

  it("lists the demo's submitted cases as needing action, with their counts", async () => {
    const list = await rows('helen');
    const incisor = list.find((r) => r.tooth === 21)!;
    expect(incisor).toMatchObject({
      student: { id: ids.tomas, name: 'Tomas Lindqvist' },
      setting: 'patient',
      chartRef: 'LK-40517',
      state: 'submitted',
      canals: 1,
      stops: 0,
      unfilled: 0,
      coneFits: [],
      since: { kind: 'submitted', at: incisor.submittedAt },
    });
    expect(incisor.cautions).toBeGreaterThan(0);
    expect(list.every((r) => r.state === 'submitted')).toBe(true);
  });
});

describe('filters, orders and pages over 120 cases of one student', () => {
  const BASE = Date.parse('2026-10-01T08:00:00.000Z');
  const TEETH = [11, 14, 16, 23, 35, 46, null, 54] as const;
  const STATES = ['submitted', 'open', 'returned', 'approved'] as const;
  let student = 0;
  interface Made {
    id: string;
    i: number;
    state: (typeof STATES)[number];
    tooth: number | null;
    chart: string | null;
    stops: number;
    cautions: number;
    unfilled: number;
    since: string;
  }
  const made: Made[] = [];
  const iso = (ms: number) => new Date(ms).toISOString();

  beforeAll(async () => {
    student = await addStudent(k, 'Quinn Fixture', [ids.helen!]);
    for (let i = 0; i < 120; i++) {
      const state = STATES[i % 4]!;
      const tooth = TEETH[i % 8]!;
      const chart = tooth !== null && i % 3 === 0 ? `QF-${String(i).padStart(3, '0')}` : null;
      const opened = iso(BASE + i * 60_000);
      // Submitted in an order unlike the order of opening.
      const submitted = state === 'open' ? null : iso(BASE + 86_400_000 + ((i * 37) % 120) * 3_600_000);
      const signed = state === 'approved' ? iso(Date.parse(submitted!) + 1_800_000) : null;
      const canals = [
        { stops: i % 5 === 0 ? 1 : 0, cautions: i % 3 },
        { unfilled: i % 6 === 0 },
        ...(i % 10 === 0 ? [{ stops: 9, cautions: 9, unfilled: true, removed: true }] : []),
      ];
      const id = await addCase(
        k,
        {
          student_id: student,
          setting: tooth === null ? 'block' : chart ? 'patient' : 'extracted',
          tooth,
          chart_ref: chart,
          opened_at: opened,
          submitted_at: submitted,
          review_status: state,
          signed_off_at: signed,
        },
        canals,
      );
      const since = state === 'open' ? opened : state === 'approved' ? signed! : submitted!;
      made.push({
        id,
        i,
        state,
        tooth,
        chart,
        stops: i % 5 === 0 ? 1 : 0,
        cautions: i % 3,
        unfilled: i % 6 === 0 ? 1 : 0,
        since,
      });
    }
  });

  const byWaiting = (a: Made, b: Made) => (a.since < b.since ? -1 : a.since > b.since ? 1 : a.id < b.id ? -1 : 1);

  it('pages through every case in the waiting order, 50 at a time, each case once with its counts', async () => {
    const got = await allPages('helen', `state=all&student=${student}`);
    expect(caseIds(got)).toEqual([...made].sort(byWaiting).map((m) => m.id));
    for (const row of got) {
      const m = made.find((x) => x.id === row.caseId)!;
      expect(row, `case ${m.i}`).toMatchObject({
        state: m.state,
        tooth: m.tooth,
        chartRef: m.chart,
        canals: 2,
        stops: m.stops,
        cautions: m.cautions,
        unfilled: m.unfilled,
        since: { at: m.since },
      });
    }
  });

  it('keeps paging stable while cases arrive: no case twice, none skipped', async () => {
    const query = `state=all&student=${student}`;
    const extra: string[] = [];
    const got = await allPages('helen', query, async () => {
      // One case that sorts before the pages already read, one after them all.
      for (const at of ['2026-01-01T00:00:00.000Z', '2027-06-01T00:00:00.000Z'])
        extra.push(
          await addCase(
            k,
            {
              student_id: student,
              setting: 'block',
              tooth: null,
              chart_ref: null,
              opened_at: at,
              submitted_at: null,
              review_status: 'open',
            },
            [],
          ),
        );
    });
    const seen = caseIds(got);
    expect(new Set(seen).size).toBe(seen.length);
    expect(seen).toEqual(expect.arrayContaining(made.map((m) => m.id)));
    expect(seen).toContain(extra.at(-1));
    await k('cases').whereIn('id', extra).delete();
  });

  it('filters by state, needs-action being the submitted ones here', async () => {
    for (const state of ['open', 'returned', 'approved'] as const) {
      const got = await allPages('helen', `state=${state}&student=${student}`);
      expect(caseIds(got).sort(), state).toEqual(
        made
          .filter((m) => m.state === state)
          .map((m) => m.id)
          .sort(),
      );
    }
    const needs = await rows('helen', `student=${student}`);
    expect(caseIds(needs)).toEqual(
      made
        .filter((m) => m.state === 'submitted')
        .sort(byWaiting)
        .map((m) => m.id),
    );
  });

  it('filters by tooth group on the FDI number, leaving training blocks out', async () => {
    const groups = { anterior: [11, 23], premolar: [14, 35], molar: [16, 46, 54] };
    for (const [group, teeth] of Object.entries(groups)) {
      const got = await allPages('helen', `state=all&student=${student}&toothGroup=${group}`);
      expect(caseIds(got).sort(), group).toEqual(
        made
          .filter((m) => m.tooth !== null && teeth.includes(m.tooth))
          .map((m) => m.id)
          .sort(),
      );
    }
  });

  it('filters by open stops, counting live canals only', async () => {
    const withStops = await allPages('helen', `state=all&student=${student}&hasStops=true`);
    const without = await allPages('helen', `state=all&student=${student}&hasStops=false`);
    expect(caseIds(withStops).sort()).toEqual(
      made
        .filter((m) => m.stops > 0)
        .map((m) => m.id)
        .sort(),
    );
    expect(without).toHaveLength(made.filter((m) => m.stops === 0).length);
  });

  it('finds a chart number exactly or by its beginning, in any case, and never in the middle', async () => {
    const q = (text: string) => allPages('helen', `state=all&q=${encodeURIComponent(text)}`);
    expect(caseIds(await q('QF-003'))).toEqual([made[3]!.id]);
    expect(caseIds(await q('qf-00')).sort()).toEqual(
      made
        .filter((m) => m.chart?.startsWith('QF-00'))
        .map((m) => m.id)
        .sort(),
    );
    expect(await q('F-00')).toEqual([]);
    expect(await q('%')).toEqual([]);
    // An underscore is a character, not a wildcard.
    const literal = await addCase(
      k,
      {
        student_id: student,
        setting: 'patient',
        tooth: 36,
        chart_ref: 'QZ_1',
        opened_at: iso(BASE),
        submitted_at: null,
        review_status: 'open',
      },
      [],
    );
    const lookalike = await addCase(
      k,
      {
        student_id: student,
        setting: 'patient',
        tooth: 36,
        chart_ref: 'QZA1',
        opened_at: iso(BASE),
        submitted_at: null,
        review_status: 'open',
      },
      [],
    );
    expect(caseIds(await q('qz_'))).toEqual([literal]);
    expect(await allPages('samuel', 'state=all&q=QZ')).toEqual([]);
    await k('cases').whereIn('id', [literal, lookalike]).delete();
  });

  it('orders by tooth (blocks last), by most stops, and by student name, across pages', async () => {
    const tooth = await allPages('helen', `state=all&student=${student}&sort=tooth`);
    const key = (r: QueueRow) => r.tooth ?? 1000;
    expect(tooth).toHaveLength(120);
    for (let i = 1; i < tooth.length; i++) {
      const [a, b] = [tooth[i - 1]!, tooth[i]!];
      expect(key(a) < key(b) || (key(a) === key(b) && a.since.at <= b.since.at), `row ${i}`).toBe(true);
    }
    const stops = await allPages('helen', `state=all&student=${student}&sort=stops`);
    expect(stops).toHaveLength(120);
    for (let i = 1; i < stops.length; i++) {
      const [a, b] = [stops[i - 1]!, stops[i]!];
      expect(a.stops > b.stops || (a.stops === b.stops && a.cautions >= b.cautions), `row ${i}`).toBe(true);
    }
    const byName = await allPages('ingrid', 'state=all&sort=student');
    const names = byName.map((r) => r.student.name.toLowerCase());
    expect(names).toEqual([...names].sort());
    expect(new Set(caseIds(byName)).size).toBe(byName.length);
  });
});

describe('bad parameters', () => {
  it.each([
    ['state=waiting', 'state'],
    ['student=mira', 'student'],
    ['student=0', 'student'],
    ['toothGroup=canine', 'toothGroup'],
    ['hasStops=yes', 'hasStops'],
    ['sort=oldest', 'sort'],
    [`q=${'A'.repeat(65)}`, 'q'],
    ['cursor=not-a-cursor', 'cursor'],
    ['state=open&state=all', 'state'],
    ['page=2', 'page'],
  ])('answers 400 naming the parameter for %s', async (query, field) => {
    const res = await queue('helen', query);
    expect(res.status).toBe(400);
    expect(res.body.field).toBe(field);
    expect((res.body as unknown as { error: string }).error).toContain(field);
  });

  it('refuses a cursor made for another order', async () => {
    const pages = await queue('ingrid', 'state=all');
    expect(pages.body.nextCursor).not.toBeNull();
    const res = await queue('ingrid', `state=all&sort=stops&cursor=${encodeURIComponent(pages.body.nextCursor!)}`);
    expect(res.status).toBe(400);
    expect(res.body.field).toBe('cursor');
  });
});

describe('pending cone-fit items', () => {
  /** An open case of Mira's with canals MB and D set up through sync, nothing else recorded. */
  async function openCase() {
    const w = new EventWriter();
    w.open('extracted', 46);
    const mb = w.canal('MB', 21);
    const d = w.canal('D', 21.5);
    const res = await as.mira!.post('/api/sync', { deviceId: 'queue-test', events: w.events });
    expect(res.status).toBe(200);
    return { caseId: w.caseId, mb, d, w };
  }
  const ev = (caseId: string, canalId: string, type: string, data: Record<string, unknown> = {}) => ({
    caseId,
    canalId,
    userId: ids.mira!,
    type,
    data,
  });
  const request = (caseId: string, canalId: string, at: string, receivedAt = at) =>
    addEvent(k, ev(caseId, canalId, 'conefit.requested'), at, receivedAt);
  const itemsOf = async (caseId: string, who = 'helen') =>
    (await rows(who)).find((r) => r.caseId === caseId)?.coneFits ?? null;
  const now = () => new Date().toISOString();
  const signConeFit = async (
    caseId: string,
    canalId: string,
    decision: 'approve' | 'return',
    expectedState = 'open',
  ) => {
    const res = await as.helen!.post(`/api/cases/${caseId}/signoffs`, {
      id: randomUUID(),
      checkpoint: 'cone-fit',
      canalId,
      decision,
      ...(decision === 'return' ? { comment: 'Re-fit the cone.' } : {}),
      expectedState,
    });
    expect(res.status).toBe(201);
    return ((await res.json()) as { signoff: { at: string } }).signoff.at;
  };

  it('puts an open case with a request at the top of needs-action, with the canal, kind and time', async () => {
    const c = await openCase();
    const at = '2026-12-04T10:15:00.000Z';
    const eventId = await request(c.caseId, c.mb, at, now());
    const list = await rows('helen');
    expect(list[0]!.caseId).toBe(c.caseId);
    expect(list[0]).toMatchObject({
      state: 'open',
      since: { kind: 'cone-fit', at },
      coneFits: [{ canalId: c.mb, canalName: 'MB', kind: 'requested', eventId, recordedAt: at }],
    });
    expect(list[0]!.coneFits[0]).not.toHaveProperty('attendingId');
    // The director sees it too; an unassigned attending does not.
    expect(await itemsOf(c.caseId, 'ingrid')).toHaveLength(1);
    expect(await itemsOf(c.caseId, 'samuel')).toBeNull();
  });

  it('shows an approval recorded at the chair with the attending it names, until confirmed', async () => {
    const c = await openCase();
    const eventId = await addEvent(
      k,
      ev(c.caseId, c.d, 'conefit.approvedAtChair', { attendingId: String(ids.helen) }),
      now(),
    );
    expect(await itemsOf(c.caseId)).toEqual([
      expect.objectContaining({
        canalName: 'D',
        kind: 'at-chair',
        eventId,
        attendingId: String(ids.helen),
        attendingName: 'Dr Helen Vasquez',
      }),
    ]);
    await signConeFit(c.caseId, c.d, 'approve');
    expect(await itemsOf(c.caseId)).toBeNull();
  });

  it('takes each canal’s latest live event: a void hides it, a void of the void brings it back', async () => {
    const c = await openCase();
    const first = await request(c.caseId, c.mb, '2026-12-04T10:00:00.000Z', now());
    const chair = await addEvent(
      k,
      ev(c.caseId, c.mb, 'conefit.approvedAtChair', { attendingId: 'no-such-attending' }),
      '2026-12-04T10:05:00.000Z',
      now(),
    );
    expect(await itemsOf(c.caseId)).toEqual([
      expect.objectContaining({ eventId: chair, kind: 'at-chair', attendingName: null }),
    ]);
    const voidChair = await addEvent(k, ev(c.caseId, c.mb, 'event.voided', { eventId: chair, reason: '' }), now());
    expect(await itemsOf(c.caseId)).toEqual([expect.objectContaining({ eventId: first, kind: 'requested' })]);
    await addEvent(k, ev(c.caseId, c.mb, 'event.voided', { eventId: first, reason: '' }), now());
    expect(await itemsOf(c.caseId)).toBeNull();
    // A void of the void: the approval at the chair stands again.
    await addEvent(k, ev(c.caseId, c.mb, 'event.voided', { eventId: voidChair, reason: '' }), now());
    expect(await itemsOf(c.caseId)).toEqual([expect.objectContaining({ eventId: chair })]);
    // A void on another canal voids nothing here.
    await addEvent(k, ev(c.caseId, c.d, 'event.voided', { eventId: chair, reason: '' }), now());
    expect(await itemsOf(c.caseId)).toEqual([expect.objectContaining({ eventId: chair })]);
  });

  it('clears an item with a later cone-fit sign-off of either decision, and shows a request made after it', async () => {
    const c = await openCase();
    await request(c.caseId, c.mb, now());
    await request(c.caseId, c.d, now());
    const returnedAt = await signConeFit(c.caseId, c.mb, 'return');
    expect((await itemsOf(c.caseId))!.map((i) => i.canalName)).toEqual(['D']);
    const at = await signConeFit(c.caseId, c.d, 'approve');
    expect(await itemsOf(c.caseId)).toBeNull();
    // Received after the sign-off: pending again, even when the tablet's clock says earlier.
    const again = await request(c.caseId, c.d, '2026-12-01T09:00:00.000Z', new Date(Date.parse(at) + 1).toISOString());
    expect(await itemsOf(c.caseId)).toEqual([expect.objectContaining({ eventId: again })]);
    // Received before it (sent late from an older outbox, say): the sign-off answered it.
    await request(c.caseId, c.mb, now(), new Date(Date.parse(returnedAt) - 1).toISOString());
    expect((await itemsOf(c.caseId))!.map((i) => i.canalName)).toEqual(['D']);
  });

  it('leaves out withdrawn canals and signed-off cases, and keeps items on a submitted case', async () => {
    const c = await openCase();
    // Canal D withdrawn through sync first (the projection marks it removed), then both asked for.
    const canalAdded = c.w.events.find((e) => e.type === 'canal.added' && e.canalId === c.d)!;
    const res = await as.mira!.post('/api/sync', {
      deviceId: 'queue-test',
      events: [c.w.add('event.voided', { eventId: canalAdded.id, reason: 'set up twice' }, c.d)],
    });
    expect(res.status).toBe(200);
    expect(await k('canals').where({ id: c.d }).first('status')).toEqual({ status: 'removed' });
    await request(c.caseId, c.mb, now());
    await request(c.caseId, c.d, now());
    expect((await itemsOf(c.caseId))!.map((i) => i.canalName)).toEqual(['MB']);
    await k('cases').where({ id: c.caseId }).update({ review_status: 'submitted', submitted_at: now() });
    const submitted = (await rows('helen')).find((r) => r.caseId === c.caseId)!;
    expect(submitted).toMatchObject({ state: 'submitted', since: { kind: 'cone-fit' } });
    expect(submitted.coneFits).toHaveLength(1);
    await k('cases').where({ id: c.caseId }).update({ review_status: 'approved', signed_off_at: now() });
    expect(await itemsOf(c.caseId)).toBeNull();
    const approved = (await rows('helen', 'state=approved')).find((r) => r.caseId === c.caseId)!;
    expect(approved.coneFits).toEqual([]);
  });
});
