// Numbers, dates and times as every screen shows them.

/** A length's number with one decimal, for rulers and diagrams: 17 → "17.0". */
export function mmValue(value: number): string {
  return value.toFixed(1);
}

/** A length with one decimal and its unit: 17 → "17.0 mm"; anything else → "—". */
export function mm(value: unknown): string {
  return typeof value === 'number' && Number.isFinite(value) ? `${mmValue(value)} mm` : '—';
}

/**
 * A sear level relative to the CEJ in words, the one wording every screen uses (the stored
 * value is positive below the CEJ, negative above): 1 → "1.0 mm below the CEJ",
 * -0.5 → "0.5 mm above the CEJ", 0 → "at the CEJ". No signs, so no plus or minus to misread.
 */
export function cejLevel(relativeToCejMm: number): string {
  if (relativeToCejMm === 0) return 'at the CEJ';
  return `${mmValue(Math.abs(relativeToCejMm))} mm ${relativeToCejMm > 0 ? 'below' : 'above'} the CEJ`;
}

/** The clinic's time zone (IANA) and locale (BCP 47): every date and time is shown in these. */
export interface Clinic {
  timeZone: string;
  locale: string;
}

/** Used until the server says otherwise: a teaching clinic in the UK, dates as day/month/year. */
export const DEFAULT_CLINIC: Readonly<Clinic> = { timeZone: 'Europe/London', locale: 'en-GB' };

/** Why `clinic` cannot be used, or null. Intl is the judge: it knows the zones and locales of this runtime. */
export function clinicProblem(clinic: Clinic): string | null {
  try {
    if (Intl.DateTimeFormat.supportedLocalesOf([clinic.locale]).length === 0) {
      return `the locale "${clinic.locale}" is not known to this runtime`;
    }
  } catch {
    return `"${clinic.locale}" is not a locale (use a tag such as en-GB)`;
  }
  try {
    new Intl.DateTimeFormat(clinic.locale, { timeZone: clinic.timeZone });
  } catch {
    return `"${clinic.timeZone}" is not a time zone (use an IANA name such as Europe/London)`;
  }
  return null;
}

export type InstantStyle = 'date' | 'time' | 'dateTime';
const OPTIONS: Record<InstantStyle, Intl.DateTimeFormatOptions> = {
  date: { day: 'numeric', month: 'short', year: 'numeric' },
  time: { hour: '2-digit', minute: '2-digit' },
  dateTime: { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit' },
};
const formats = new Map<string, Intl.DateTimeFormat>();

/**
 * An ISO instant in the clinic's zone and locale, e.g. "2026-03-01T23:30:00Z" in
 * Pacific/Auckland, en-GB, 'date' → "2 Mar 2026". An unreadable instant → "—".
 */
export function formatInstant(iso: string, clinic: Clinic, style: InstantStyle = 'dateTime'): string {
  const t = Date.parse(iso);
  if (!Number.isFinite(t)) return '—';
  const key = `${clinic.locale}|${clinic.timeZone}|${style}`;
  let f = formats.get(key);
  if (!f) {
    f = new Intl.DateTimeFormat(clinic.locale, { ...OPTIONS[style], timeZone: clinic.timeZone });
    formats.set(key, f);
  }
  return f.format(t);
}

const AGO_STEPS: readonly [Intl.RelativeTimeFormatUnit, number][] = [
  ['minute', 60_000],
  ['hour', 3_600_000],
  ['day', 86_400_000],
];
const agoFormats = new Map<string, Intl.RelativeTimeFormat>();

/**
 * How long before `now` (epoch ms) the instant `iso` was, in the clinic's locale: "just now"
 * under a minute, then whole minutes, hours (from 1 h) and days (from 24 h), e.g. "3 hours ago"
 * or "yesterday". An instant ahead of `now` (a tablet's clock) reads "just now"; an
 * unreadable one "—".
 */
export function formatAgo(iso: string, now: number, clinic: Clinic): string {
  const t = Date.parse(iso);
  if (!Number.isFinite(t)) return '—';
  const ms = now - t;
  if (ms < 60_000) return 'just now';
  let f = agoFormats.get(clinic.locale);
  if (!f) {
    f = new Intl.RelativeTimeFormat(clinic.locale, { numeric: 'auto' });
    agoFormats.set(clinic.locale, f);
  }
  const [unit, size] = ms < 3_600_000 ? AGO_STEPS[0]! : ms < 86_400_000 ? AGO_STEPS[1]! : AGO_STEPS[2]!;
  return f.format(-Math.floor(ms / size), unit);
}
