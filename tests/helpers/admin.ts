/** For the director's account, cohort and case-list tests: accounts of their own, the database, the audit log. */
import { randomUUID } from 'node:crypto';
import knexFactory, { type Knex } from 'knex';
import { sqliteOptions } from '../../src/lib/server/knex-options';
import type { Role } from '../../src/lib/contract';
import { hashPassword } from '../../src/lib/server/users';
import { DEMO, type ApiClient } from './client';
import type { TestServer } from './server';

export async function withDb<T>(server: TestServer, fn: (k: Knex) => Promise<T>): Promise<T> {
  const k = knexFactory(sqliteOptions(server.dbFile));
  try {
    return await fn(k);
  } finally {
    await k.destroy();
  }
}

let hash: Promise<string> | null = null;

/** Adds an account (password DEMO.password) so that a test changes nobody else's; answers its id. */
export async function addAccount(
  server: TestServer,
  email: string,
  role: Role,
  extra: { name?: string; cohortId?: number | null; active?: boolean } = {},
): Promise<number> {
  hash ??= hashPassword(DEMO.password);
  const password_hash = await hash;
  return withDb(server, async (k) => {
    const [row] = await k('users')
      .insert({
        email,
        name: extra.name ?? email.split('@')[0]!,
        role,
        password_hash,
        cohort_id: extra.cohortId ?? null,
        active: extra.active ?? true,
      })
      .returning('id');
    return row!.id;
  });
}

export async function assign(server: TestServer, attendingId: number, studentId: number): Promise<void> {
  await withDb(server, (k) => k('assignments').insert({ attending_id: attendingId, student_id: studentId }));
}

/** The id of a demo account by e-mail. */
export async function idOf(server: TestServer, email: string): Promise<number> {
  return withDb(server, async (k) => (await k('users').where({ email }).first('id'))!.id);
}

/** Audit lines about one subject, oldest first. */
export async function auditOf(
  server: TestServer,
  subjectType: string,
  subjectId: number,
): Promise<{ action: string; actor_id: number | null; detail: Record<string, unknown> | null }[]> {
  return withDb(server, async (k) =>
    (
      await k('audit_log')
        .where({ subject_type: subjectType, subject_id: String(subjectId) })
        .orderBy('id')
    ).map((r) => ({
      action: r.action,
      actor_id: r.actor_id,
      detail: r.detail_json ? (JSON.parse(r.detail_json) as Record<string, unknown>) : null,
    })),
  );
}

/** A JSON write with a fresh request id unless the body names one. */
export async function send(
  api: ApiClient,
  method: 'POST' | 'PUT' | 'PATCH',
  path: string,
  body: Record<string, unknown> = {},
): Promise<{ status: number; body: Record<string, unknown> }> {
  const res = await api.post(path, { id: randomUUID(), ...body }, { method });
  return { status: res.status, body: (await res.json()) as Record<string, unknown> };
}

export const meStatus = async (server: TestServer, cookie: string): Promise<number> =>
  (await fetch(`${server.baseUrl}/api/me`, { headers: { Cookie: cookie } })).status;
