/**
 * Every state-changing request carries a client-made `id`. The same id again gets the first
 * answer; the same id with another body gets 409. Bodies are kept only as a keyed hash (a
 * password change carries passwords), never as text.
 */
import { createHmac } from 'node:crypto';
import type { Knex } from 'knex';
import { config } from './config';

export interface Answer {
  status: number;
  body: Record<string, unknown>;
}

/** Key order does not matter: the body is hashed in a canonical form. */
function canonical(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonical).join(',')}]`;
  if (value && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>).sort(([a], [b]) => (a < b ? -1 : 1));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonical(v)}`).join(',')}}`;
  }
  return JSON.stringify(value ?? null);
}

export function bodyHash(route: string, body: unknown): string {
  return createHmac('sha256', config().authSecret)
    .update(`${route}\n${canonical(body)}`)
    .digest('hex');
}

export const conflict: Answer = {
  status: 409,
  body: { error: 'This request id was already used for a different request; send it again with a new id.' },
};

/**
 * Runs `handle` once per (user, id): a repeat with the same body answers the stored answer,
 * one with another body (or for another route) answers 409. Server faults are not stored,
 * so they can be retried with the same id.
 */
export async function once(
  k: Knex,
  req: { userId: number; id: string; route: string; body: unknown },
  handle: () => Promise<Answer>,
): Promise<Answer> {
  const hash = bodyHash(req.route, req.body);
  const prior = await k('request_ids').where({ user_id: req.userId, id: req.id }).first();
  if (prior) return prior.body_hash === hash && prior.route === req.route ? stored(prior) : conflict;
  const answer = await handle();
  if (answer.status >= 500) return answer;
  // Two copies racing: the first answer stored is the one of record.
  await k('request_ids')
    .insert({
      id: req.id,
      user_id: req.userId,
      route: req.route,
      body_hash: hash,
      status: answer.status,
      answer_json: JSON.stringify(answer.body),
      at: new Date().toISOString(),
    })
    .onConflict(['user_id', 'id'])
    .ignore();
  return answer;
}

function stored(row: { status: number; answer_json: string }): Answer {
  return { status: row.status, body: JSON.parse(row.answer_json) as Record<string, unknown> };
}
