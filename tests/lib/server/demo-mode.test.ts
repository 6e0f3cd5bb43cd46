import { describe, expect, it } from 'vitest';
import { cachedFor } from '../../../src/lib/server/demo-mode';

function counter(values: boolean[]) {
  let calls = 0;
  return { load: async () => values[Math.min(calls++, values.length - 1)]!, calls: () => calls };
}

describe('cachedFor', () => {
  it('asks the database once for many requests within the time it keeps the answer', async () => {
    let now = 1_000;
    const c = counter([true]);
    const demoMode = cachedFor(3_000, c.load, () => now);
    expect(await Promise.all([demoMode(), demoMode(), demoMode()])).toEqual([true, true, true]);
    now += 2_999;
    expect(await demoMode()).toBe(true);
    expect(c.calls()).toBe(1);
  });

  it('asks again once the answer is older than the time it keeps it, so a removal shows within seconds', async () => {
    let now = 1_000;
    const c = counter([true, false]);
    const demoMode = cachedFor(3_000, c.load, () => now);
    expect(await demoMode()).toBe(true);
    now += 3_000;
    expect(await demoMode()).toBe(false);
    expect(c.calls()).toBe(2);
  });

  it('keeps no failed answer: the next caller tries again', async () => {
    let fail = true;
    const demoMode = cachedFor(3_000, async () => {
      if (fail) throw new Error('database is locked');
      return true;
    });
    await expect(demoMode()).rejects.toThrow('locked');
    fail = false;
    expect(await demoMode()).toBe(true);
  });
});
