/** The answers the director's account, cohort and assignment services give, in one shape. */
import type { Answer } from './request-ids';

/** An answer with a typed body (the contract's answer interfaces). */
export function answer(status: number, body: object): Answer {
  return { status, body: body as Record<string, unknown> };
}

/** A refusal: `code` names the reason for programs, `field` the form field it is about. */
export function refuse(status: number, error: string, extra: { code?: string; field?: string } = {}): Answer {
  return { status, body: { error, ...extra } };
}

export const NO_SUCH_ACCOUNT = refuse(404, 'No such account.');

/** Services check the role themselves too: the route's check must not be the only one. */
export function notDirector(user: SessionUser): Answer | null {
  return user.role === 'director' ? null : refuse(403, 'Only a director may do this.');
}
