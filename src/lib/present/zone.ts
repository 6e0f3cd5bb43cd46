// A calendar day in the clinic's zone as instants: what "from 1 Dec to 5 Dec" means to a filter.

const DAY_RE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** Whether `day` is a real calendar day written YYYY-MM-DD. */
export function isDay(day: string): boolean {
  const m = DAY_RE.exec(day);
  if (!m) return false;
  const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
  return d.toISOString().slice(0, 10) === day;
}

/** How far `timeZone`'s wall clock is ahead of UTC at instant `t` (ms; negative west of Greenwich). */
function offsetAt(t: number, timeZone: string): number {
  const parts = new Intl.DateTimeFormat('en-US', {
    timeZone,
    hourCycle: 'h23',
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
    hour: '2-digit',
    minute: '2-digit',
    second: '2-digit',
  }).formatToParts(t);
  const n = (type: string) => Number(parts.find((p) => p.type === type)?.value);
  const wall = Date.UTC(n('year'), n('month') - 1, n('day'), n('hour'), n('minute'), n('second'));
  return wall - Math.floor(t / 1000) * 1000;
}

/**
 * The instant (ISO 8601, UTC) the day `day` (YYYY-MM-DD) begins in `timeZone`, e.g.
 * ('2026-06-01', 'Europe/London') → "2026-05-31T23:00:00.000Z". `offsetDays` moves the day
 * first (1: the start of the next day, the end of a range that includes `day`).
 */
export function dayStartIn(day: string, timeZone: string, offsetDays = 0): string {
  const m = DAY_RE.exec(day);
  if (!m || !isDay(day)) throw new RangeError(`${day} is not a day written YYYY-MM-DD`);
  const midnight = Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]) + offsetDays);
  // Twice: the offset at the first guess can differ from the one at the answer (a clock change).
  let t = midnight - offsetAt(midnight, timeZone);
  t = midnight - offsetAt(t, timeZone);
  return new Date(t).toISOString();
}
