/**
 * The sign-in route (src/pages/api/auth/[...auth].ts) checks the limits, then runs Auth.js;
 * Auth.js calls `authorize` (auth.config.ts) deep inside. This context carries the outcome
 * back out, so the route counts failures per account and address without parsing redirects,
 * and `authorize` refuses to check a password that did not come through the route.
 */
import { AsyncLocalStorage } from 'node:async_hooks';

export interface SigninAttempt {
  outcome?: 'signed-in' | 'wrong';
}

export const signinAttempt = new AsyncLocalStorage<SigninAttempt>();

/** Longest e-mail address (RFC 5321's path limit) and password the sign-in form takes. */
export const MAX_EMAIL_LENGTH = 254;
export const MAX_PASSWORD_LENGTH = 200;
/** The whole sign-in form, urlencoded: both fields at their limits fit with room to spare. */
export const MAX_SIGNIN_BODY_BYTES = 4096;
