import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { closeDb } from '../../../src/lib/client/db';
import { askToKeepData } from '../../../src/lib/client/storage';

beforeEach(async () => {
  await closeDb();
  globalThis.indexedDB = new IDBFactory();
});

describe('askToKeepData', () => {
  it('asks the browser once per user, and reports a refusal without asking again', async () => {
    const storage = { persist: vi.fn(async () => false), persisted: vi.fn(async () => false) };
    expect(await askToKeepData(3, storage)).toBe('refused');
    expect(await askToKeepData(3, storage)).toBe('refused');
    expect(storage.persist).toHaveBeenCalledTimes(1);
    expect(await askToKeepData(4, storage)).toBe('refused');
    expect(storage.persist).toHaveBeenCalledTimes(2);
  });

  it('does not ask when the data is already kept', async () => {
    const storage = { persist: vi.fn(async () => true), persisted: vi.fn(async () => true) };
    expect(await askToKeepData(3, storage)).toBe('persisted');
    expect(storage.persist).not.toHaveBeenCalled();
  });

  it('says so when the browser has no storage manager', async () => {
    expect(await askToKeepData(3, undefined)).toBe('unsupported');
  });
});
