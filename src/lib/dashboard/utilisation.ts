import type { ClinicHours } from '../schemas/settings';
import { eachDay, weekday, type Period } from './period';

const minutesOf = (clock: string) => Number(clock.slice(0, 2)) * 60 + Number(clock.slice(3, 5));

/**
 * Minutes one room is open over a period: each day's opening spans from the clinic hours
 * (wall-clock time, so a daylight-saving night changes nothing), none on closed dates.
 *
 * @example openMinutesPerRoom({ from: '2026-12-07', to: '2026-12-13' }, DEFAULT_CLINIC_HOURS) → 2940 (5 × 9 h + 4 h)
 */
export function openMinutesPerRoom(period: Period, hours: ClinicHours): number {
  const closed = new Set(hours.closedDates);
  let total = 0;
  for (const day of eachDay(period)) {
    if (closed.has(day)) continue;
    for (const span of hours.weekly[weekday(day)] ?? []) total += minutesOf(span.close) - minutesOf(span.open);
  }
  return total;
}

/** A part of a whole in percent with one decimal, or null when the whole is nothing, e.g. ratePercent(1, 3) → 33.3. */
export function ratePercent(part: number, whole: number): number | null {
  return whole > 0 ? Math.round((1000 * part) / whole) / 10 : null;
}
