// Cohorts and assignments (docs/accounts.md): a director creates, renames and archives
// cohorts, moves students between them and sets each student's attendings — which decides
// who may read and review the student's cases. Names are unique whatever their case; archived
// cohorts take no new students; every write is idempotent by its id and audited.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AccountSummary, CohortSummary } from '../../src/lib/contract';
import { addAccount, auditOf, idOf, send } from '../helpers/admin';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let ingrid: ApiClient;
let ingridId: number;
const ids: Record<'mira' | 'tomas' | 'priya' | 'helen' | 'samuel', number> = {
  mira: 0,
  tomas: 0,
  priya: 0,
  helen: 0,
  samuel: 0,
};

beforeAll(async () => {
  server = await startServer();
  ingrid = await apiSignIn(server.baseUrl, DEMO.ingrid, DEMO.password);
  ingridId = await idOf(server, DEMO.ingrid);
  for (const k of Object.keys(ids) as (keyof typeof ids)[]) ids[k] = await idOf(server, DEMO[k]);
});
afterAll(async () => {
  await server?.stop();
});

async function cohorts(): Promise<CohortSummary[]> {
  const res = await ingrid.fetch('/api/cohorts');
  expect(res.status).toBe(200);
  return ((await res.json()) as { cohorts: CohortSummary[] }).cohorts;
}
async function account(userId: number): Promise<AccountSummary> {
  const res = await ingrid.fetch('/api/users');
  return ((await res.json()) as { accounts: AccountSummary[] }).accounts.find((a) => a.userId === userId)!;
}
async function create(name: string, graduationYear?: number | null): Promise<CohortSummary> {
  const res = await send(ingrid, 'POST', '/api/cohorts', { name, graduationYear });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.cohort as CohortSummary;
}

describe('POST /api/cohorts', () => {
  it('creates a cohort, lists it with no students, and writes the audit line', async () => {
    const made = await create('Larkfield class of 2030', 2030);
    expect(made).toMatchObject({ name: 'Larkfield class of 2030', graduationYear: 2030, archived: false, members: 0 });
    expect((await cohorts()).map((c) => c.name)).toContain('Larkfield class of 2030');
    expect(await auditOf(server, 'cohort', made.cohortId)).toEqual([
      {
        action: 'cohort.created',
        actor_id: ingridId,
        detail: { name: 'Larkfield class of 2030', graduationYear: 2030 },
      },
    ]);
  });

  it('refuses a name already taken, whatever its case (409 naming the field)', async () => {
    const res = await send(ingrid, 'POST', '/api/cohorts', { name: 'LARKFIELD CLASS OF 2028' });
    expect(res.status).toBe(409);
    expect(res.body).toMatchObject({ code: 'name-taken', field: 'name' });
  });

  it('names the field of a body that does not read (400), storing nothing', async () => {
    const before = (await cohorts()).length;
    for (const [body, field] of [
      [{ name: '   ' }, 'name'],
      [{ name: 'x'.repeat(121) }, 'name'],
      [{ name: 'Year typo', graduationYear: 20300 }, 'graduationYear'],
      [{ name: 'Year as text', graduationYear: '2030' }, 'graduationYear'],
    ] as const) {
      const res = await send(ingrid, 'POST', '/api/cohorts', body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.field).toBe(field);
    }
    expect((await cohorts()).length).toBe(before);
  });

  it('answers the same id again with the first answer, and the same id with another name 409', async () => {
    const id = randomUUID();
    const first = await send(ingrid, 'POST', '/api/cohorts', { id, name: 'Evening cohort' });
    expect(first.status).toBe(201);
    expect(await send(ingrid, 'POST', '/api/cohorts', { id, name: 'Evening cohort' })).toEqual(first);
    expect((await send(ingrid, 'POST', '/api/cohorts', { id, name: 'Morning cohort' })).status).toBe(409);
    expect((await cohorts()).filter((c) => /Evening|Morning/.test(c.name)).map((c) => c.name)).toEqual([
      'Evening cohort',
    ]);
  });
});

describe('PATCH /api/cohorts/{cohortId}', () => {
  it('renames a cohort and sets its class year, each change audited', async () => {
    const c = await create('Summer intake');
    const res = await send(ingrid, 'PATCH', `/api/cohorts/${c.cohortId}`, {
      name: 'Summer intake 2027',
      graduationYear: 2031,
    });
    expect(res.status).toBe(200);
    expect(res.body.cohort).toMatchObject({ name: 'Summer intake 2027', graduationYear: 2031 });
    expect((await auditOf(server, 'cohort', c.cohortId)).map((l) => [l.action, l.detail])).toEqual([
      ['cohort.created', { name: 'Summer intake', graduationYear: null }],
      ['cohort.renamed', { from: 'Summer intake', to: 'Summer intake 2027' }],
      ['cohort.class-year-set', { from: null, to: 2031 }],
    ]);
  });

  it('refuses renaming to a name another cohort has (409), and an unknown cohort (404)', async () => {
    const c = await create('Rename me');
    const taken = await send(ingrid, 'PATCH', `/api/cohorts/${c.cohortId}`, { name: 'larkfield class of 2028' });
    expect(taken.status).toBe(409);
    expect(taken.body).toMatchObject({ code: 'name-taken', field: 'name' });
    expect((await send(ingrid, 'PATCH', '/api/cohorts/987654', { name: 'Nobody' })).status).toBe(404);
    const nothing = await send(ingrid, 'PATCH', `/api/cohorts/${c.cohortId}`, {});
    expect(nothing.status).toBe(400);
    expect((await cohorts()).find((x) => x.cohortId === c.cohortId)?.name).toBe('Rename me');
  });

  it('archives a cohort: kept with its students, closed to new ones until brought back', async () => {
    const c = await create('Archive me');
    const student = await addAccount(server, 'archived.member@larkfield.example', 'student', { cohortId: c.cohortId });
    const newcomer = await addAccount(server, 'late.joiner@larkfield.example', 'student');
    const res = await send(ingrid, 'PATCH', `/api/cohorts/${c.cohortId}`, { archived: true });
    expect(res.status).toBe(200);
    expect(res.body.cohort).toMatchObject({ archived: true, members: 1 });
    expect((await account(student)).cohort).toMatchObject({ cohortId: c.cohortId, archived: true });
    const refused = await send(ingrid, 'POST', `/api/users/${newcomer}/cohort`, { cohortId: c.cohortId });
    expect(refused.status).toBe(409);
    expect(refused.body).toMatchObject({ code: 'archived', field: 'cohortId' });
    expect((await send(ingrid, 'PATCH', `/api/cohorts/${c.cohortId}`, { archived: false })).status).toBe(200);
    expect((await send(ingrid, 'POST', `/api/users/${newcomer}/cohort`, { cohortId: c.cohortId })).status).toBe(200);
    expect((await auditOf(server, 'cohort', c.cohortId)).map((l) => l.action)).toEqual([
      'cohort.created',
      'cohort.archived',
      'cohort.restored',
    ]);
  });
});

describe('POST /api/users/{userId}/cohort', () => {
  it('moves a student between cohorts and out of every cohort, audited only when something moved', async () => {
    const to = await create('Move target');
    const res = await send(ingrid, 'POST', `/api/users/${ids.priya}/cohort`, { cohortId: to.cohortId });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ moved: true, user: { cohort: { cohortId: to.cohortId, name: 'Move target' } } });
    expect((await cohorts()).find((c) => c.cohortId === to.cohortId)?.members).toBe(1);
    const again = await send(ingrid, 'POST', `/api/users/${ids.priya}/cohort`, { cohortId: to.cohortId });
    expect(again.body).toMatchObject({ moved: false });
    const out = await send(ingrid, 'POST', `/api/users/${ids.priya}/cohort`, { cohortId: null });
    expect(out.body).toMatchObject({ moved: true, user: { cohort: null } });
    expect((await auditOf(server, 'user', ids.priya)).filter((l) => l.action === 'user.cohort-changed')).toHaveLength(
      2,
    );
  });

  it('refuses a cohort that does not exist (404 naming cohortId), a non-student (409) and a bad id (400)', async () => {
    const unknown = await send(ingrid, 'POST', `/api/users/${ids.mira}/cohort`, { cohortId: 987654 });
    expect(unknown.status).toBe(404);
    expect(unknown.body).toMatchObject({ field: 'cohortId' });
    const c = (await cohorts())[0]!;
    expect((await send(ingrid, 'POST', `/api/users/${ids.helen}/cohort`, { cohortId: c.cohortId })).body).toMatchObject(
      {
        code: 'not-a-student',
      },
    );
    const bad = await send(ingrid, 'POST', `/api/users/${ids.mira}/cohort`, { cohortId: 'Class of 2028' });
    expect(bad.status).toBe(400);
    expect(bad.body).toMatchObject({ field: 'cohortId' });
    expect((await send(ingrid, 'POST', `/api/users/987654/cohort`, { cohortId: null })).status).toBe(404);
  });
});

describe('PUT /api/users/{studentId}/assignments', () => {
  const caseOf = async (studentId: number) => {
    const res = await ingrid.fetch(`/api/cases?student=${studentId}`);
    return ((await res.json()) as { cases: { caseId: string }[] }).cases[0]!.caseId;
  };

  it('assigns a second attending, who may then read the student’s cases, and unassigns them again', async () => {
    const samuel = await apiSignIn(server.baseUrl, DEMO.samuel, DEMO.password);
    const caseId = await caseOf(ids.mira);
    expect((await samuel.fetch(`/api/cases/${caseId}`)).status).toBe(404);

    const res = await send(ingrid, 'PUT', `/api/users/${ids.mira}/assignments`, {
      attendingIds: [ids.helen, ids.samuel],
    });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ added: [ids.samuel], removed: [] });
    expect((res.body.attendings as { name: string }[]).map((a) => a.name)).toEqual([
      'Dr Helen Vasquez',
      'Dr Samuel Osei',
    ]);
    expect((await samuel.fetch(`/api/cases/${caseId}`)).status).toBe(200);

    const back = await send(ingrid, 'PUT', `/api/users/${ids.mira}/assignments`, { attendingIds: [ids.helen] });
    expect(back.body).toMatchObject({ added: [], removed: [ids.samuel] });
    expect((await samuel.fetch(`/api/cases/${caseId}`)).status).toBe(404);
    const read = await ingrid.fetch(`/api/users/${ids.mira}/assignments`);
    expect(((await read.json()) as { attendings: { userId: number }[] }).attendings.map((a) => a.userId)).toEqual([
      ids.helen,
    ]);
    expect(
      (await auditOf(server, 'user', ids.mira)).filter((l) => l.action === 'assignments.changed').map((l) => l.detail),
    ).toEqual([
      { added: [ids.samuel], removed: [] },
      { added: [], removed: [ids.samuel] },
    ]);
  });

  it('writes nothing when the set is unchanged', async () => {
    const before = (await auditOf(server, 'user', ids.tomas)).length;
    const res = await send(ingrid, 'PUT', `/api/users/${ids.tomas}/assignments`, {
      attendingIds: [ids.samuel, ids.helen],
    });
    expect(res.body).toMatchObject({ added: [], removed: [] });
    expect((await auditOf(server, 'user', ids.tomas)).length).toBe(before);
  });

  it('refuses an unknown account (404), a non-attending (400), a deactivated attending (409) and a non-student (409), each naming attendingIds', async () => {
    const gone = await addAccount(server, 'gone.attending@larkfield.example', 'attending', { active: false });
    const cases: [number[], number, string | undefined][] = [
      [[987654], 404, undefined],
      [[ids.tomas], 400, undefined],
      [[gone], 409, 'inactive'],
      [[ids.helen, ids.helen], 400, undefined],
    ];
    for (const [attendingIds, status, code] of cases) {
      const res = await send(ingrid, 'PUT', `/api/users/${ids.priya}/assignments`, { attendingIds });
      expect(res.status, JSON.stringify(attendingIds)).toBe(status);
      expect(res.body.field).toBe('attendingIds');
      if (code) expect(res.body.code).toBe(code);
    }
    expect((await account(ids.priya)).attendings.map((a) => a.userId)).toEqual([ids.samuel]);
    const notStudent = await send(ingrid, 'PUT', `/api/users/${ids.helen}/assignments`, { attendingIds: [] });
    expect(notStudent.body).toMatchObject({ code: 'not-a-student' });
  });

  it('is refused to students and attendings (403), and replays the same id', async () => {
    for (const who of [DEMO.mira, DEMO.helen]) {
      const api = await apiSignIn(server.baseUrl, who, DEMO.password);
      expect(
        (await send(api, 'PUT', `/api/users/${ids.priya}/assignments`, { attendingIds: [ids.helen] })).status,
      ).toBe(403);
      expect((await send(api, 'POST', '/api/cohorts', { name: 'Student cohort' })).status).toBe(403);
      expect((await api.fetch('/api/cohorts')).status).toBe(403);
    }
    const id = randomUUID();
    const first = await send(ingrid, 'PUT', `/api/users/${ids.priya}/assignments`, {
      id,
      attendingIds: [ids.samuel, ids.helen],
    });
    expect(first.body).toMatchObject({ added: [ids.helen] });
    expect(
      await send(ingrid, 'PUT', `/api/users/${ids.priya}/assignments`, { id, attendingIds: [ids.samuel, ids.helen] }),
    ).toEqual(first);
    expect((await send(ingrid, 'PUT', `/api/users/${ids.priya}/assignments`, { id, attendingIds: [] })).status).toBe(
      409,
    );
  });
});
