import { describe, expect, it } from 'vitest';
import { cejLevel, clinicProblem, DEFAULT_CLINIC, formatAgo, formatInstant, mm } from '../../../src/lib/present/format';

describe('formatInstant', () => {
  // Invented times. Auckland is 13 h ahead of UTC in March (daylight saving), so late evening
  // UTC is already the next day there.
  const auckland = { timeZone: 'Pacific/Auckland', locale: 'en-GB' };

  it('shows the clinic’s date where it differs from the UTC date', () => {
    expect(formatInstant('2026-03-01T23:30:00Z', auckland, 'date')).toBe('2 Mar 2026');
    expect(formatInstant('2026-03-01T23:30:00Z', { timeZone: 'UTC', locale: 'en-GB' }, 'date')).toBe('1 Mar 2026');
  });

  it('shows the clinic’s time of day', () => {
    expect(formatInstant('2026-03-01T23:30:00Z', auckland, 'time')).toBe('12:30');
    expect(formatInstant('2026-07-01T08:05:00Z', DEFAULT_CLINIC, 'time')).toBe('09:05');
  });

  it('follows the clinic’s locale', () => {
    expect(formatInstant('2026-03-01T23:30:00Z', { timeZone: 'America/New_York', locale: 'en-US' }, 'date')).toBe(
      'Mar 1, 2026',
    );
  });

  it('shows a dash for an instant it cannot read', () => {
    expect(formatInstant('not a date', DEFAULT_CLINIC)).toBe('—');
  });
});

describe('formatAgo', () => {
  const now = Date.parse('2026-12-07T14:00:00Z');
  const ago = (ms: number) => formatAgo(new Date(now - ms).toISOString(), now, DEFAULT_CLINIC);

  it('says "just now" under a minute, and for an instant ahead of now', () => {
    expect(ago(59_000)).toBe('just now');
    expect(ago(-120_000)).toBe('just now');
  });

  it('counts whole minutes under an hour, whole hours under a day, then days', () => {
    expect(ago(60_000)).toBe('1 minute ago');
    expect(ago(59 * 60_000 + 59_000)).toBe('59 minutes ago');
    expect(ago(3 * 3_600_000 + 59 * 60_000)).toBe('3 hours ago');
    expect(ago(86_400_000)).toBe('yesterday');
    expect(ago(3 * 86_400_000)).toBe('3 days ago');
  });

  it('follows the clinic’s locale, and shows a dash for an instant it cannot read', () => {
    expect(formatAgo('2026-12-07T12:00:00Z', now, { timeZone: 'Europe/Berlin', locale: 'de-DE' })).toBe(
      'vor 2 Stunden',
    );
    expect(formatAgo('soon', now, DEFAULT_CLINIC)).toBe('—');
  });
});

describe('clinicProblem', () => {
  it('accepts the default and refuses a zone or locale Intl does not know', () => {
    expect(clinicProblem(DEFAULT_CLINIC)).toBeNull();
    expect(clinicProblem({ timeZone: 'Mars/Olympus', locale: 'en-GB' })).toMatch(/time zone/);
    expect(clinicProblem({ timeZone: 'Europe/London', locale: 'not a locale!' })).toMatch(/locale/);
  });
});

describe('mm', () => {
  it('shows one decimal and the unit, and a dash for no value', () => {
    expect(mm(17)).toBe('17.0 mm');
    expect(mm(undefined)).toBe('—');
  });
});

describe('cejLevel', () => {
  it('says how far below or above the CEJ, in words and without a sign', () => {
    expect(cejLevel(1)).toBe('1.0 mm below the CEJ');
    expect(cejLevel(-0.5)).toBe('0.5 mm above the CEJ');
    expect(cejLevel(0)).toBe('at the CEJ');
    for (let v = -5; v <= 5; v += 0.5) expect(cejLevel(v)).not.toMatch(/[-+−]/);
  });
});
