import { describe, expect, it } from 'vitest';
import { clearFailures, isThrottled, MAX_FAILURES, recordFailure, WINDOW_MS } from '../../../src/lib/server/throttle';

describe('the sign-in throttle', () => {
  it('holds an account after five failures in the window, in any letter case, and lets go after it', () => {
    const t0 = 1_000_000;
    for (let i = 0; i < MAX_FAILURES - 1; i++) recordFailure('A@Example.org', t0 + i);
    expect(isThrottled('a@example.org', t0 + 10)).toBe(false);
    recordFailure('a@example.org', t0 + 10);
    expect(isThrottled('A@example.org', t0 + 11)).toBe(true);
    expect(isThrottled('other@example.org', t0 + 11)).toBe(false);
    expect(isThrottled('a@example.org', t0 + 10 + WINDOW_MS)).toBe(false);
  });

  it('forgets the failures once the account signs in', () => {
    for (let i = 0; i < MAX_FAILURES; i++) recordFailure('b@example.org', 5_000 + i);
    clearFailures('B@example.org');
    expect(isThrottled('b@example.org', 5_100)).toBe(false);
  });
});
