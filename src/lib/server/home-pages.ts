/**
 * What the server-rendered home and case pages show, read through one service each, so that
 * no page or component opens the database itself. Each checks nothing beyond what its callers
 * pass: the middleware and the route have already decided who may see the page.
 */
import type { CaseSummary, Signoff } from '../contract';
import { UUID_RE } from './access';
import { caseDetail, listCases, type CaseDetail } from './cases';
import { db } from './db';
import { signoffsByCase } from './review-page';

/** The student's cases, and every sign-off of them by case id (what came back, and why). */
export async function studentHome(
  user: SessionUser,
): Promise<{ cases: CaseSummary[]; signoffs: Map<string, Signoff[]> }> {
  return { cases: await listCases(await db(), user), signoffs: await signoffsByCase(user) };
}

export async function attendingHome(
  user: SessionUser,
): Promise<{ waiting: CaseSummary[]; others: CaseSummary[]; students: string[] }> {
  const k = await db();
  const waiting = await listCases(k, user, { reviewStatus: ['submitted'] });
  const others = await listCases(k, user, { reviewStatus: ['open', 'returned', 'approved'] });
  const students = await k('assignments')
    .join('users', 'users.id', 'assignments.student_id')
    .where('assignments.attending_id', user.id)
    .orderBy('users.name')
    .pluck('users.name');
  return { waiting, others, students };
}

export interface DirectorOverview {
  caseCount: number;
  cohorts: { name: string; graduationYear: number | null; members: number }[];
  people: { name: string; email: string; role: Role; active: boolean }[];
  topFindings: { code: string; severity: 'stop' | 'caution' | 'note'; count: number }[];
}

export async function directorHome(): Promise<DirectorOverview> {
  const k = await db();
  const cohorts = await k('cohorts')
    .leftJoin('users', 'users.cohort_id', 'cohorts.id')
    .groupBy('cohorts.id', 'cohorts.name', 'cohorts.graduation_year')
    .orderBy('cohorts.name')
    .select('cohorts.name', 'cohorts.graduation_year')
    .count<{ name: string; graduation_year: number | null; members: number | string }[]>({ members: 'users.id' });
  const people = await k('users').select('name', 'email', 'role', 'active').orderBy(['role', 'name']);
  // Discarded cases leave the counts as they leave the lists.
  const total = await k('cases').whereNull('discarded_at').count<{ n: number | string }[]>({ n: '*' });
  const top = await k('findings')
    .join('cases', 'cases.id', 'findings.case_id')
    .whereNull('cases.discarded_at')
    .select('findings.code as code', 'findings.severity as severity')
    .count<{ code: string; severity: 'stop' | 'caution' | 'note'; n: number | string }[]>({ n: '*' })
    .groupBy('findings.code', 'findings.severity')
    .orderBy('n', 'desc')
    .limit(5);
  return {
    caseCount: Number(total[0]?.n ?? 0),
    cohorts: cohorts.map((c) => ({ name: c.name, graduationYear: c.graduation_year, members: Number(c.members) })),
    people: people.map((p) => ({ name: p.name, email: p.email, role: p.role, active: Boolean(p.active) })),
    topFindings: top.map((f) => ({ code: f.code, severity: f.severity, count: Number(f.n) })),
  };
}

/** The case page's data, or null when the case is not there or not the user's to read. */
export async function casePage(
  user: SessionUser,
  caseId: string,
): Promise<(CaseDetail & { studentName: string }) | null> {
  if (!UUID_RE.test(caseId)) return null;
  const k = await db();
  const detail = await caseDetail(k, user, caseId);
  if (!detail) return null;
  const student = await k('users').where({ id: detail.case.student_id }).first('name');
  return { ...detail, studentName: student?.name ?? '' };
}
