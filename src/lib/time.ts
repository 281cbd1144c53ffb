/**
 * Clinic-time helpers. Instants are stored in UTC; the clinic's IANA time zone (a setting)
 * is applied only for display and for "today" (STYLE.md rule 10). Pure Intl, no library.
 */

interface ZonedParts {
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  second: number;
}

const partFormatters = new Map<string, Intl.DateTimeFormat>();

function partsIn(instant: Date, timeZone: string): ZonedParts {
  let fmt = partFormatters.get(timeZone);
  if (!fmt) {
    fmt = new Intl.DateTimeFormat('en-US', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
    });
    partFormatters.set(timeZone, fmt);
  }
  const out: Record<string, number> = {};
  for (const p of fmt.formatToParts(instant)) {
    if (p.type !== 'literal') out[p.type] = Number(p.value);
  }
  return out as unknown as ZonedParts;
}

/** Minutes the zone is ahead of UTC at that instant, e.g. -360 for Chicago in winter. */
export function zoneOffsetMinutes(instant: Date, timeZone: string): number {
  const p = partsIn(instant, timeZone);
  const asUtc = Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute, p.second);
  return Math.round((asUtc - Math.floor(instant.getTime() / 1000) * 1000) / 60_000);
}

/** The calendar date (YYYY-MM-DD) an instant falls on in the zone. */
export function zonedDate(instant: Date, timeZone: string): string {
  const p = partsIn(instant, timeZone);
  return `${p.year}-${pad(p.month)}-${pad(p.day)}`;
}

/** The clock time (HH:MM, 24 h) of an instant in the zone. */
export function zonedClock(instant: Date, timeZone: string): string {
  const p = partsIn(instant, timeZone);
  return `${pad(p.hour)}:${pad(p.minute)}`;
}

/**
 * The UTC instant of a wall-clock time in the zone, e.g. zonedTimeToUtc('2026-12-02', 9, 0,
 * 'America/Chicago') → 2026-12-02T15:00:00Z. A time skipped by a spring-forward shift maps
 * to the instant one offset later; an ambiguous autumn time maps to its first occurrence.
 */
export function zonedTimeToUtc(isoDate: string, hour: number, minute: number, timeZone: string): Date {
  const [y, m, d] = isoDate.split('-').map(Number) as [number, number, number];
  const wall = Date.UTC(y, m - 1, d, hour, minute);
  const first = wall - zoneOffsetMinutes(new Date(wall), timeZone) * 60_000;
  const second = wall - zoneOffsetMinutes(new Date(first), timeZone) * 60_000;
  const showsWall = (t: number) => t + zoneOffsetMinutes(new Date(t), timeZone) * 60_000 === wall;
  const valid = [first, second].filter(showsWall);
  // Overlap: both candidates are real, take the earlier. Gap: neither is, take the later,
  // which reads as the same clock time pushed forward by the size of the gap.
  return new Date(valid.length ? Math.min(...valid) : Math.max(first, second));
}

/** [start, end) of a clinic day as UTC instants. */
export function zonedDayRange(isoDate: string, timeZone: string): { start: Date; end: Date } {
  return { start: zonedTimeToUtc(isoDate, 0, 0, timeZone), end: zonedTimeToUtc(addDays(isoDate, 1), 0, 0, timeZone) };
}

/** Adds whole days to an ISO date, e.g. addDays('2026-12-31', 1) → '2027-01-01'. */
export function addDays(isoDate: string, days: number): string {
  const [y, m, d] = isoDate.split('-').map(Number) as [number, number, number];
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10);
}

/** Age in whole years on a date, from ISO dates, e.g. ageOn('1980-06-15', '2026-06-14') → 45. */
export function ageOn(birthDate: string, onDate: string): number {
  const [by, bm, bd] = birthDate.split('-').map(Number) as [number, number, number];
  const [y, m, d] = onDate.split('-').map(Number) as [number, number, number];
  return y - by - (m < bm || (m === bm && d < bd) ? 1 : 0);
}

// Making an Intl formatter costs far more than using one: one for the whole process.
const dayFormat = new Intl.DateTimeFormat('en-GB', { timeZone: 'UTC', weekday: 'short', day: 'numeric', month: 'short', year: 'numeric' });

/** Human date in the zone, e.g. "Wed 2 Dec 2026". */
export function formatDay(isoDate: string): string {
  const [y, m, d] = isoDate.split('-').map(Number) as [number, number, number];
  return dayFormat.format(new Date(Date.UTC(y, m - 1, d)));
}

function pad(n: number): string {
  return String(n).padStart(2, '0');
}

/** An instant as the clinic reads it, e.g. "Thu 3 Dec 2026 at 09:15". */
export function formatInstant(instant: Date, timeZone: string): string {
  return `${formatDay(zonedDate(instant, timeZone))} at ${zonedClock(instant, timeZone)}`;
}

/**
 * A fast clock formatter for instants inside one clinic day: when the zone's offset is the same
 * at both ends of the day (no clock change), times are worked out arithmetically instead of
 * through Intl for every row; otherwise it falls back to zonedClock.
 */
export function dayClock(isoDate: string, timeZone: string): (instant: Date) => string {
  const { start, end } = zonedDayRange(isoDate, timeZone);
  const offset = zoneOffsetMinutes(start, timeZone);
  if (offset !== zoneOffsetMinutes(new Date(end.getTime() - 1), timeZone)) return (instant) => zonedClock(instant, timeZone);
  return (instant) => {
    const minutes = Math.floor((instant.getTime() / 60_000 + offset) % 1440 + 1440) % 1440;
    return `${pad(Math.floor(minutes / 60))}:${pad(minutes % 60)}`;
  };
}
