/**
 * Sign-in throttle: after a run of failed attempts on one account, further attempts are
 * refused for a while, so a password cannot be guessed at speed. Kept in memory: one server
 * process serves a clinic (a restart forgets, which errs on the side of letting people in).
 */
export const MAX_FAILURES = 5;
export const WINDOW_MS = 15 * 60 * 1000;

const failures = new Map<string, number[]>();

function recent(key: string, now: number): number[] {
  const list = (failures.get(key) ?? []).filter((t) => now - t < WINDOW_MS);
  if (list.length > 0) failures.set(key, list);
  else failures.delete(key);
  return list;
}

/** True while the account has had MAX_FAILURES failed attempts within the window. */
export function isThrottled(email: string, now = Date.now()): boolean {
  return recent(email.trim().toLowerCase(), now).length >= MAX_FAILURES;
}

export function recordFailure(email: string, now = Date.now()): void {
  const key = email.trim().toLowerCase();
  failures.set(key, [...recent(key, now), now]);
}

/** A successful sign-in clears the account's count. */
export function clearFailures(email: string): void {
  failures.delete(email.trim().toLowerCase());
}
