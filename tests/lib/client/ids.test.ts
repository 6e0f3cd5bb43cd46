import { afterEach, describe, expect, it, vi } from 'vitest';
import { newId } from '../../../src/lib/client/ids';

const UUID_V4 = /^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/;

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('newId', () => {
  it('uses crypto.randomUUID where the browser has it', () => {
    vi.stubGlobal('crypto', { randomUUID: () => '8f6c0c43-2a0e-4c53-9f7e-1d2b9c0e6a11' });
    expect(newId()).toBe('8f6c0c43-2a0e-4c53-9f7e-1d2b9c0e6a11');
  });

  it('falls back to the uuid package outside a secure context', () => {
    vi.stubGlobal('crypto', {
      getRandomValues: (a: Uint8Array) => {
        for (let i = 0; i < a.length; i++) a[i] = (i * 37) & 255;
        return a;
      },
    });
    expect(newId()).toMatch(UUID_V4);
  });
});
