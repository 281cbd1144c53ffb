import { addDays, zoneOffsetMinutes } from '../time';

/** The longest period the dashboard answers for, in clinic days (a leap year). */
export const MAX_PERIOD_DAYS = 366;

export const PERIOD_PRESETS = ['week', 'last-30', 'month', 'custom'] as const;
export type PeriodPreset = (typeof PERIOD_PRESETS)[number];

export const PERIOD_PRESET_LABELS: Record<PeriodPreset, string> = {
  week: 'This week',
  'last-30': 'Last 30 days',
  month: 'This month',
  custom: 'Chosen dates',
};

export interface Period {
  /** First clinic day, YYYY-MM-DD. */
  from: string;
  /** Last clinic day, included. */
  to: string;
}

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** Whether a string is a real calendar date written YYYY-MM-DD, e.g. '2026-02-30' → false. */
export function isCalendarDate(value: string): boolean {
  const m = ISO_DATE.exec(value);
  if (!m) return false;
  const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
  return d.toISOString().slice(0, 10) === value;
}

/** Clinic days from `from` to `to`, both included, e.g. periodDays('2026-12-01', '2026-12-07') → 7. */
export function periodDays(from: string, to: string): number {
  return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000) + 1;
}

/** Every date of a period, in order. */
export function eachDay({ from, to }: Period): string[] {
  const days: string[] = [];
  for (let d = from; d <= to; d = addDays(d, 1)) days.push(d);
  return days;
}

/** Day of the week of an ISO date, 0 = Sunday. */
export function weekday(isoDate: string): number {
  return new Date(`${isoDate}T12:00:00Z`).getUTCDay();
}

/**
 * The period a preset names, seen from the clinic's today: this week runs Monday to Sunday,
 * the last 30 days end today, this month runs from the 1st to its last day.
 *
 * @example presetPeriod('week', '2026-12-03') → { from: '2026-11-30', to: '2026-12-06' }
 */
export function presetPeriod(preset: Exclude<PeriodPreset, 'custom'>, today: string): Period {
  if (preset === 'last-30') return { from: addDays(today, -29), to: today };
  if (preset === 'month') {
    const from = `${today.slice(0, 7)}-01`;
    const next = addDays(`${today.slice(0, 7)}-28`, 4); // always in the next month
    return { from, to: addDays(`${next.slice(0, 7)}-01`, -1) };
  }
  const monday = addDays(today, -((weekday(today) + 6) % 7));
  return { from: monday, to: addDays(monday, 6) };
}

export interface OffsetSegment {
  /** The segment ends just before this instant; null for the last one. */
  until: Date | null;
  /** Minutes the clinic's clock is ahead of UTC during the segment. */
  offsetMinutes: number;
}

/**
 * The clinic's UTC offset over [start, end), split where it changes (daylight saving), so the
 * database can put each instant on its clinic day with plain arithmetic. Found day by day, then
 * to the minute within a day that changes.
 *
 * @example offsetSegments(2026-11-01T05:00Z, 2026-11-02T06:00Z, 'America/Chicago')
 *          → [{ until: 2026-11-01T07:00Z, offsetMinutes: -300 }, { until: null, offsetMinutes: -360 }]
 */
export function offsetSegments(start: Date, end: Date, timeZone: string): OffsetSegment[] {
  const segments: OffsetSegment[] = [];
  let current = zoneOffsetMinutes(start, timeZone);
  for (let t = start.getTime(); t < end.getTime(); ) {
    const next = Math.min(t + 86_400_000, end.getTime());
    const after = zoneOffsetMinutes(new Date(next - 60_000), timeZone);
    if (after !== current) {
      // The first whole minute with the new offset lies in (t, next - 1 min].
      let lo = Math.floor(t / 60_000);
      let hi = Math.floor((next - 60_000) / 60_000);
      while (lo + 1 < hi) {
        const mid = Math.floor((lo + hi) / 2);
        if (zoneOffsetMinutes(new Date(mid * 60_000), timeZone) === current) lo = mid;
        else hi = mid;
      }
      segments.push({ until: new Date(hi * 60_000), offsetMinutes: current });
      current = after;
    }
    t = next;
  }
  segments.push({ until: null, offsetMinutes: current });
  return segments;
}
