// The sign-in limits as a service, against a migrated SQLite file: holds, expiry, liftHolds.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import knexFactory, { type Knex } from 'knex';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { bundledMigrations } from '../../../src/lib/server/db';
import { sqliteOptions } from '../../../src/lib/server/knex-options';
import { liftHolds, recordSigninFailure, recordSigninSuccess, signinHold } from '../../../src/lib/server/signin-limits';

let dir: string;
let k: Knex;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'coneline-limits-'));
  k = knexFactory(sqliteOptions(join(dir, 'db.sqlite')));
  await k.migrate.latest({ migrationSource: bundledMigrations });
});
afterAll(async () => {
  vi.useRealTimers();
  await k?.destroy();
  rmSync(dir, { recursive: true, force: true });
});

async function fail(email: string, address: string, n: number) {
  for (let i = 0; i < n; i++) await recordSigninFailure(k, email, address);
}

describe('signinHold', () => {
  it('holds a pair at the fifth failure, not the fourth', async () => {
    await fail('four@x.example', '10.0.0.1', 4);
    expect(await signinHold(k, 'four@x.example', '10.0.0.1')).toBe(0);
    await fail('four@x.example', '10.0.0.1', 1);
    expect(await signinHold(k, 'four@x.example', '10.0.0.1')).toBeGreaterThan(0);
  });

  it('reads the e-mail without regard to case or spaces', async () => {
    await fail('Mixed.Case@X.example ', '10.0.0.2', 5);
    expect(await signinHold(k, 'mixed.case@x.example', '10.0.0.2')).toBeGreaterThan(0);
  });

  it('lets a hold lapse once the 15-minute window has passed', async () => {
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(new Date('2026-12-03T10:00:00Z'));
    await fail('lapse@x.example', '10.0.0.3', 5);
    expect(await signinHold(k, 'lapse@x.example', '10.0.0.3')).toBeGreaterThan(0);
    vi.setSystemTime(new Date('2026-12-03T10:15:01Z'));
    expect(await signinHold(k, 'lapse@x.example', '10.0.0.3')).toBe(0);
    vi.useRealTimers();
  });

  it('is cleared for its pair by a success', async () => {
    await fail('cleared@x.example', '10.0.0.4', 4);
    await recordSigninSuccess(k, 'cleared@x.example', '10.0.0.4');
    await fail('cleared@x.example', '10.0.0.4', 4);
    expect(await signinHold(k, 'cleared@x.example', '10.0.0.4')).toBe(0);
  });
});

describe('liftHolds', () => {
  it('lifts an account’s holds from every address and leaves other accounts held', async () => {
    await fail('lift_me@x.example', '10.0.1.1', 5);
    await fail('lift_me@x.example', '10.0.1.2', 5);
    // '_' is a LIKE wildcard: this account must not be lifted along with lift_me.
    await fail('liftXme@x.example', '10.0.1.1', 5);
    expect(await liftHolds(k, 'LIFT_ME@x.example')).toBe(2);
    expect(await signinHold(k, 'lift_me@x.example', '10.0.1.1')).toBe(0);
    expect(await signinHold(k, 'lift_me@x.example', '10.0.1.2')).toBe(0);
    expect(await signinHold(k, 'liftXme@x.example', '10.0.1.1')).toBeGreaterThan(0);
  });
});
