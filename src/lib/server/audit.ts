/**
 * The audit log: who did what to which record. Never holds names; a chart number only where a
 * patient case leaves the lists (a discard), so the clinic can still trace it.
 */
import type { Knex } from 'knex';

export async function audit(
  k: Knex,
  actorId: number | null,
  action: string,
  subjectType: string | null,
  subjectId: string | null,
  detail?: Record<string, unknown>,
): Promise<void> {
  await k('audit_log').insert({
    at: new Date().toISOString(),
    actor_id: actorId,
    action,
    subject_type: subjectType,
    subject_id: subjectId,
    detail_json: detail ? JSON.stringify(detail) : null,
  });
}
