// Days in the clinic's zone as instants: what the audit log's from/to filters mean.
import { describe, expect, it } from 'vitest';
import { dayStartIn, isDay } from '../../../src/lib/present/zone';

describe('isDay', () => {
  it('takes real days written YYYY-MM-DD and nothing else', () => {
    expect(isDay('2026-12-05')).toBe(true);
    expect(isDay('2028-02-29')).toBe(true);
    for (const bad of ['2026-02-30', '2026-13-01', '2026-1-05', '05/12/2026', '', '2026-12-05T00:00'])
      expect(isDay(bad), bad).toBe(false);
  });
});

describe('dayStartIn', () => {
  it('puts midnight in the zone, in winter and in summer time', () => {
    expect(dayStartIn('2026-01-15', 'Europe/London')).toBe('2026-01-15T00:00:00.000Z');
    expect(dayStartIn('2026-06-01', 'Europe/London')).toBe('2026-05-31T23:00:00.000Z');
    expect(dayStartIn('2026-06-01', 'Pacific/Auckland')).toBe('2026-05-31T12:00:00.000Z');
    expect(dayStartIn('2026-12-05', 'Pacific/Auckland')).toBe('2026-12-04T11:00:00.000Z');
    expect(dayStartIn('2026-12-05', 'America/New_York')).toBe('2026-12-05T05:00:00.000Z');
  });

  it('gets the days the clocks change right, and the next day with offsetDays', () => {
    // London goes to summer time at 01:00 UTC on 29 March 2026; the day before is 23 hours long in Auckland's April change.
    expect(dayStartIn('2026-03-29', 'Europe/London')).toBe('2026-03-29T00:00:00.000Z');
    expect(dayStartIn('2026-03-29', 'Europe/London', 1)).toBe('2026-03-29T23:00:00.000Z');
    expect(dayStartIn('2026-04-05', 'Pacific/Auckland')).toBe('2026-04-04T11:00:00.000Z');
    expect(dayStartIn('2026-04-05', 'Pacific/Auckland', 1)).toBe('2026-04-05T12:00:00.000Z');
    expect(dayStartIn('2026-12-31', 'Europe/London', 1)).toBe('2027-01-01T00:00:00.000Z');
  });

  it('refuses what is not a day', () => {
    expect(() => dayStartIn('2026-02-30', 'Europe/London')).toThrow(/not a day/);
  });
});
