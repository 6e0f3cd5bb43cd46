import { describe, expect, it } from 'vitest';
import { CardWindow, RepeatFilter, TAP_GUARD_MS } from '../../../src/lib/client/tapGuard';

describe('TAP_GUARD_MS', () => {
  it('covers a gloved double tap 180 ms apart and stays under half a second', () => {
    expect(TAP_GUARD_MS).toBeGreaterThan(180);
    expect(TAP_GUARD_MS).toBeLessThan(500);
  });
});

describe('CardWindow', () => {
  it('ignores taps for the window after a card appears, and takes them after', () => {
    const w = new CardWindow();
    w.show('seat-3', 1000);
    expect(w.accepts(1180)).toBe(false);
    expect(w.accepts(1000 + TAP_GUARD_MS - 1)).toBe(false);
    expect(w.accepts(1000 + TAP_GUARD_MS)).toBe(true);
  });

  it('ignores a tap made before the card appeared (meant for the card before it)', () => {
    const w = new CardWindow();
    w.show('taper-4', 5000);
    expect(w.accepts(4990)).toBe(false);
  });

  it('restarts the window only when the card changes', () => {
    const w = new CardWindow();
    w.show('seat-3', 1000);
    w.show('seat-3', 2000);
    expect(w.accepts(1000 + TAP_GUARD_MS)).toBe(true);
    w.show('taper-4', 2000);
    expect(w.accepts(2100)).toBe(false);
  });

  it('takes every tap before any card was shown', () => {
    expect(new CardWindow().accepts(0)).toBe(true);
  });
});

describe('RepeatFilter', () => {
  it('lets the same answer through once within the window, counted from the one let through', () => {
    const f = new RepeatFilter();
    expect(f.repeats('seat', 0)).toBe(false);
    expect(f.repeats('seat', 0)).toBe(true);
    expect(f.repeats('seat', 300)).toBe(true);
    expect(f.repeats('seat', TAP_GUARD_MS)).toBe(false);
  });

  it('lets a different answer through at once', () => {
    const f = new RepeatFilter();
    expect(f.repeats('taper 19.5', 0)).toBe(false);
    expect(f.repeats('taper 19.0', 10)).toBe(false);
    expect(f.repeats('taper 19.5', 20)).toBe(false);
  });
});
