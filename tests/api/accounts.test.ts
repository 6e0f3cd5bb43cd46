// The director's accounts API (docs/accounts.md): deactivation ends every session and keeps
// the records, refuses yourself and the last active director; re-activation revives no
// session; a role change takes the old role's assignments with it; lifting a hold lets a held
// account in; only directors may do any of it; every write is idempotent by its id and
// leaves an audit line.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AccountSummary } from '../../src/lib/contract';
import { deactivate } from '../../src/lib/server/accounts';
import { addAccount, assign, auditOf, idOf, meStatus, send, withDb } from '../helpers/admin';
import { apiSignIn, DEMO, type ApiClient } from '../helpers/client';
import { fromAddress } from '../helpers/from-address';
import { startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let ingrid: ApiClient;
let ingridId: number;

beforeAll(async () => {
  server = await startServer();
  ingrid = await apiSignIn(server.baseUrl, DEMO.ingrid, DEMO.password);
  ingridId = await idOf(server, DEMO.ingrid);
});
afterAll(async () => {
  await server?.stop();
});

async function accounts(api: ApiClient = ingrid): Promise<AccountSummary[]> {
  const res = await api.fetch('/api/users');
  expect(res.status).toBe(200);
  return ((await res.json()) as { accounts: AccountSummary[] }).accounts;
}
const account = async (userId: number) => (await accounts()).find((a) => a.userId === userId)!;

describe('GET /api/users', () => {
  it('lists every account with its role, cohort, assignments and state', async () => {
    const list = await accounts();
    const mira = list.find((a) => a.email === DEMO.mira)!;
    expect(mira).toMatchObject({ role: 'student', active: true, heldUntil: null });
    expect(mira.cohort?.name).toBe('Larkfield class of 2028');
    expect(mira.attendings.map((a) => a.name)).toEqual(['Dr Helen Vasquez']);
    const samuel = list.find((a) => a.email === DEMO.samuel)!;
    expect(samuel.students.map((s) => s.name)).toEqual(['Priya Raman', 'Tomas Lindqvist']);
    expect(list.find((a) => a.email === DEMO.ingrid)).toMatchObject({ role: 'director', cohort: null });
  });

  it('is for directors only', async () => {
    for (const who of [DEMO.mira, DEMO.helen]) {
      const api = await apiSignIn(server.baseUrl, who, DEMO.password);
      expect((await api.fetch('/api/users')).status, who).toBe(403);
    }
  });
});

describe('POST /api/users/{userId}/deactivate', () => {
  it('ends every session of the account at once, keeps its records and refuses its sign-in', async () => {
    const email = 'two.tablets@larkfield.example';
    const id = await addAccount(server, email, 'student');
    const tablet = await apiSignIn(server.baseUrl, email, DEMO.password);
    const desk = await apiSignIn(server.baseUrl, email, DEMO.password);
    const oldCookies = [tablet.cookie, desk.cookie];
    for (const c of oldCookies) expect(await meStatus(server, c)).toBe(200);

    const res = await send(ingrid, 'POST', `/api/users/${id}/deactivate`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ sessionsEnded: 2, user: { userId: id, active: false } });
    // A replayed old cookie is signed out, on every device.
    for (const c of oldCookies) expect(await meStatus(server, c)).toBe(401);
    await expect(apiSignIn(server.baseUrl, email, DEMO.password)).rejects.toThrow(/sign-in failed/);
    // The account is still there, deactivated.
    expect(await account(id)).toMatchObject({ email, active: false });
    const lines = await auditOf(server, 'user', id);
    expect(lines.at(-1)).toMatchObject({
      action: 'user.deactivated',
      actor_id: ingridId,
      detail: { sessionsEnded: 2 },
    });
  });

  it("names a deactivated attending's students, with who else reviews each, and keeps the assignments", async () => {
    const att = await addAccount(server, 'leaving.attending@larkfield.example', 'attending', { name: 'Dr Leaving' });
    const other = await addAccount(server, 'staying.attending@larkfield.example', 'attending', { name: 'Dr Staying' });
    const alone = await addAccount(server, 'alone.student@larkfield.example', 'student', { name: 'Alone Student' });
    const shared = await addAccount(server, 'shared.student@larkfield.example', 'student', { name: 'Shared Student' });
    await assign(server, att, alone);
    await assign(server, att, shared);
    await assign(server, other, shared);
    const res = await send(ingrid, 'POST', `/api/users/${att}/deactivate`);
    expect(res.status).toBe(200);
    expect(res.body.studentsToReassign).toEqual([
      { userId: alone, name: 'Alone Student', otherAttendings: [] },
      {
        userId: shared,
        name: 'Shared Student',
        otherAttendings: [{ userId: other, name: 'Dr Staying', active: true }],
      },
    ]);
    expect((await account(shared)).attendings).toEqual([
      { userId: att, name: 'Dr Leaving', active: false },
      { userId: other, name: 'Dr Staying', active: true },
    ]);
  });

  it('refuses your own account with a clear 409, changing nothing', async () => {
    const res = await send(ingrid, 'POST', `/api/users/${ingridId}/deactivate`);
    expect(res.status).toBe(409);
    expect(res.body).toMatchObject({ code: 'self' });
    expect(res.body.error).toMatch(/your own account/);
    expect(await meStatus(server, ingrid.cookie)).toBe(200);
  });

  it('refuses the last active director, even to a director whose own deactivation landed a moment before', async () => {
    // A second director, deactivated while their request to deactivate Ingrid is in flight:
    // the service (not the session check, already passed) must keep one director active.
    const ruth = await addAccount(server, 'ruth.second.director@larkfield.example', 'director', { active: false });
    const answer = await withDb(server, (k) =>
      deactivate(
        k,
        { id: ruth, email: 'ruth.second.director@larkfield.example', name: 'Ruth', role: 'director' },
        ingridId,
      ),
    );
    expect(answer.status).toBe(409);
    expect(answer.body).toMatchObject({ code: 'last-director' });
    expect(answer.body.error).toMatch(/last active director/);
    expect((await account(ingridId)).active).toBe(true);
  });

  it('leaves one director active when two directors deactivate each other at the same moment', async () => {
    const email = 'mutual.director@larkfield.example';
    const other = await addAccount(server, email, 'director');
    const otherApi = await apiSignIn(server.baseUrl, email, DEMO.password);
    const [a, b] = await Promise.all([
      send(ingrid, 'POST', `/api/users/${other}/deactivate`),
      send(otherApi, 'POST', `/api/users/${ingridId}/deactivate`),
    ]);
    const list = await withDb(server, (k) => k('users').where({ role: 'director', active: true }).pluck('id'));
    expect(list.length).toBeGreaterThanOrEqual(1);
    // Whichever came second was refused: signed out (401) or as the last director (409).
    const statuses = [a.status, b.status].sort();
    expect(statuses[0]).toBe(200);
    expect([401, 409]).toContain(statuses[1]);
    if (a.status !== 200) {
      // Ingrid was deactivated: bring her back for the rest of the file.
      await withDb(server, (k) => k('users').where({ id: ingridId }).update({ active: true }));
      ingrid = await apiSignIn(server.baseUrl, DEMO.ingrid, DEMO.password);
    }
  });

  it('answers 404 for an account that does not exist and 409 for one already deactivated', async () => {
    expect((await send(ingrid, 'POST', '/api/users/987654/deactivate')).status).toBe(404);
    expect((await send(ingrid, 'POST', '/api/users/not-a-number/deactivate')).status).toBe(404);
    const id = await addAccount(server, 'already.off@larkfield.example', 'student', { active: false });
    const res = await send(ingrid, 'POST', `/api/users/${id}/deactivate`);
    expect(res.status).toBe(409);
    expect(res.body).toMatchObject({ code: 'unchanged' });
  });
});

describe('POST /api/users/{userId}/reactivate', () => {
  it('lets the account sign in again and brings no old session back', async () => {
    const email = 'comes.back@larkfield.example';
    const id = await addAccount(server, email, 'attending');
    const old = (await apiSignIn(server.baseUrl, email, DEMO.password)).cookie;
    expect((await send(ingrid, 'POST', `/api/users/${id}/deactivate`)).status).toBe(200);
    const res = await send(ingrid, 'POST', `/api/users/${id}/reactivate`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ user: { active: true } });
    expect(await meStatus(server, old)).toBe(401);
    await expect(apiSignIn(server.baseUrl, email, DEMO.password)).resolves.toBeDefined();
    expect((await auditOf(server, 'user', id)).map((l) => l.action)).toEqual(['user.deactivated', 'user.reactivated']);
    expect((await send(ingrid, 'POST', `/api/users/${id}/reactivate`)).body).toMatchObject({ code: 'unchanged' });
  });
});

describe('POST /api/users/{userId}/role', () => {
  it('turns an attending into a student: their assignments go, their students are named, their sessions end', async () => {
    const email = 'was.attending@larkfield.example';
    const att = await addAccount(server, email, 'attending', { name: 'Dr Former' });
    const student = await addAccount(server, 'their.student@larkfield.example', 'student', { name: 'Their Student' });
    await assign(server, att, student);
    const old = (await apiSignIn(server.baseUrl, email, DEMO.password)).cookie;
    const res = await send(ingrid, 'POST', `/api/users/${att}/role`, { role: 'student' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      from: 'attending',
      sessionsEnded: 1,
      assignmentsRemoved: [{ attendingId: att, studentId: student }],
      studentsToReassign: [{ userId: student, name: 'Their Student', otherAttendings: [] }],
      user: { role: 'student', students: [], attendings: [] },
    });
    expect(await meStatus(server, old)).toBe(401);
    expect((await account(student)).attendings).toEqual([]);
    const line = (await auditOf(server, 'user', att)).at(-1)!;
    expect(line).toMatchObject({
      action: 'user.role-changed',
      actor_id: ingridId,
      detail: { from: 'attending', to: 'student' },
    });
  });

  it('turns a student into an attending: they leave their cohort and attendings, and keep their cases', async () => {
    const tomas = await idOf(server, DEMO.tomas);
    const before = await account(tomas);
    expect(before.attendings.length).toBe(2);
    const casesBefore = await withDb(server, (k) => k('cases').where({ student_id: tomas }).pluck('id'));
    const res = await send(ingrid, 'POST', `/api/users/${tomas}/role`, { role: 'attending' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ user: { role: 'attending', cohort: null, attendings: [] } });
    expect((res.body.assignmentsRemoved as unknown[]).length).toBe(2);
    expect(await withDb(server, (k) => k('cases').where({ student_id: tomas }).pluck('id'))).toEqual(casesBefore);
    // Back again for the rest of the file (the assignments do not come back by themselves).
    expect((await send(ingrid, 'POST', `/api/users/${tomas}/role`, { role: 'student' })).status).toBe(200);
  });

  it('refuses your own role, the role already held, and a role that does not exist (naming the field)', async () => {
    const self = await send(ingrid, 'POST', `/api/users/${ingridId}/role`, { role: 'attending' });
    expect(self.status).toBe(409);
    expect(self.body).toMatchObject({ code: 'self' });
    const mira = await idOf(server, DEMO.mira);
    expect((await send(ingrid, 'POST', `/api/users/${mira}/role`, { role: 'student' })).body).toMatchObject({
      code: 'unchanged',
    });
    const bad = await send(ingrid, 'POST', `/api/users/${mira}/role`, { role: 'janitor' });
    expect(bad.status).toBe(400);
    expect(bad.body).toMatchObject({ field: 'role' });
    expect((await account(mira)).role).toBe('student');
  });
});

describe('POST /api/users/{userId}/holds/lift', () => {
  it('shows a held account and lets it sign in with the right password once the hold is lifted', async () => {
    const email = 'held.then.lifted@larkfield.example';
    const id = await addAccount(server, email, 'student');
    const address = '127.0.0.9';
    const signIn = async (password: string) => {
      const csrf = await fromAddress(address, `${server.baseUrl}/api/auth/csrf`);
      const cookie = ([] as string[])
        .concat(csrf.headers['set-cookie'] ?? [])
        .map((c) => c.split(';')[0])
        .join('; ');
      const { csrfToken } = JSON.parse(csrf.text) as { csrfToken: string };
      const res = await fromAddress(address, `${server.baseUrl}/api/auth/callback/credentials`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/x-www-form-urlencoded', Origin: server.baseUrl, Cookie: cookie },
        body: new URLSearchParams({ csrfToken, email, password, callbackUrl: '/' }).toString(),
      });
      return ([] as string[]).concat(res.headers['set-cookie'] ?? []).some((c) => /session-token=[^;]+/.test(c));
    };
    for (let i = 0; i < 5; i++) expect(await signIn(`wrong-guess-${i}`)).toBe(false);
    expect(await signIn(DEMO.password)).toBe(false);
    const held = await account(id);
    expect(held.heldUntil).not.toBeNull();
    expect(Date.parse(held.heldUntil!)).toBeGreaterThan(Date.now());

    const res = await send(ingrid, 'POST', `/api/users/${id}/holds/lift`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ holdsLifted: 1, user: { heldUntil: null } });
    expect(await signIn(DEMO.password)).toBe(true);
    expect((await auditOf(server, 'user', id)).at(-1)).toMatchObject({
      action: 'user.holds-lifted',
      detail: { holdsLifted: 1 },
    });
  });
});

describe('every account write', () => {
  it('is refused to students and attendings (403), changing nothing', async () => {
    const target = await addAccount(server, 'untouched@larkfield.example', 'student');
    for (const who of [DEMO.mira, DEMO.helen]) {
      const api = await apiSignIn(server.baseUrl, who, DEMO.password);
      for (const [path, body] of [
        [`/api/users/${target}/deactivate`, {}],
        [`/api/users/${target}/reactivate`, {}],
        [`/api/users/${target}/role`, { role: 'director' }],
        [`/api/users/${target}/holds/lift`, {}],
      ] as const)
        expect((await send(api, 'POST', path, body)).status, `${who} ${path}`).toBe(403);
    }
    expect(await account(target)).toMatchObject({ role: 'student', active: true });
    expect(await auditOf(server, 'user', target)).toEqual([]);
  });

  it('answers the same id again with the first answer, and the same id with another body 409', async () => {
    const a = await addAccount(server, 'replayed@larkfield.example', 'student');
    const b = await addAccount(server, 'other.replayed@larkfield.example', 'student');
    const id = randomUUID();
    const first = await send(ingrid, 'POST', `/api/users/${a}/deactivate`, { id });
    expect(first.status).toBe(200);
    // Not "already deactivated": the stored first answer.
    expect(await send(ingrid, 'POST', `/api/users/${a}/deactivate`, { id })).toEqual(first);
    expect((await auditOf(server, 'user', a)).filter((l) => l.action === 'user.deactivated')).toHaveLength(1);
    // The same id on another account is another request.
    const elsewhere = await send(ingrid, 'POST', `/api/users/${b}/deactivate`, { id });
    expect(elsewhere.status).toBe(409);
    expect(elsewhere.body.error).toMatch(/already used for a different request/);
    expect((await account(b)).active).toBe(true);

    const roleId = randomUUID();
    expect((await send(ingrid, 'POST', `/api/users/${b}/role`, { id: roleId, role: 'attending' })).status).toBe(200);
    expect((await send(ingrid, 'POST', `/api/users/${b}/role`, { id: roleId, role: 'director' })).status).toBe(409);
    expect((await account(b)).role).toBe('attending');
  });

  it('names the field a body gets wrong, and refuses another origin and a body that is not JSON', async () => {
    const target = await addAccount(server, 'bad.bodies@larkfield.example', 'student');
    const path = `/api/users/${target}/deactivate`;
    const noId = await ingrid.post(path, {});
    expect(noId.status).toBe(400);
    expect(await noId.json()).toMatchObject({ field: 'id' });
    const extra = await ingrid.post(path, { id: randomUUID(), reason: 'x' });
    expect(extra.status).toBe(400);
    expect(
      (await ingrid.post(path, { id: randomUUID() }, { headers: { Origin: 'https://elsewhere.example' } })).status,
    ).toBe(403);
    expect(
      (await ingrid.post(path, JSON.stringify({ id: randomUUID() }), { headers: { 'Content-Type': 'text/plain' } }))
        .status,
    ).toBe(415);
    expect((await account(target)).active).toBe(true);
  });
});
