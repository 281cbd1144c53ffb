import type { ClinicHours } from '../schemas/settings';
import { addDays, zonedDate, zonedTimeToUtc } from '../time';

/** A half-open span of time [start, end). */
export interface Span {
  start: Date;
  end: Date;
}

/** Whether two half-open spans share any instant; back-to-back spans do not. */
export function overlaps(a: Span, b: Span): boolean {
  return a.start < b.end && b.start < a.end;
}

/** The clinic's open spans on a calendar day, as UTC instants. */
export function openSpans(day: string, hours: ClinicHours, timeZone: string): Span[] {
  if (hours.closedDates.includes(day)) return [];
  const weekday = new Date(`${day}T12:00:00Z`).getUTCDay();
  return (hours.weekly[weekday] ?? []).map(({ open, close }) => {
    const [oh, om] = open.split(':').map(Number) as [number, number];
    const [ch, cm] = close.split(':').map(Number) as [number, number];
    return { start: zonedTimeToUtc(day, oh, om, timeZone), end: zonedTimeToUtc(day, ch, cm, timeZone) };
  });
}

/** Whether a span lies wholly inside one open span of its clinic day. */
export function withinOpenHours(span: Span, hours: ClinicHours, timeZone: string): boolean {
  const day = zonedDate(span.start, timeZone);
  return openSpans(day, hours, timeZone).some((o) => span.start >= o.start && span.end <= o.end);
}

export interface SlotQuery {
  /** First clinic day to look at (YYYY-MM-DD). */
  fromDay: string;
  /** How many calendar days to search. */
  days: number;
  hours: ClinicHours;
  timeZone: string;
  durationMinutes: number;
  /** Spans already taken for any of the chosen room, scanner or sonographer. */
  busy: readonly Span[];
  now: Date;
  /** Start times fall on this grid, counted from each opening time. */
  stepMinutes?: number;
  limit?: number;
}

/**
 * The next free starts that fit the duration inside opening hours and clear every busy span,
 * e.g. a 45-minute exam after a 08:00–08:30 booking is first offered at 08:30.
 */
export function freeSlots(q: SlotQuery): Date[] {
  const step = (q.stepMinutes ?? 15) * 60_000;
  const length = q.durationMinutes * 60_000;
  const limit = q.limit ?? 8;
  const busy = [...q.busy].sort((a, b) => a.start.getTime() - b.start.getTime());
  const out: Date[] = [];
  for (let d = 0; d < q.days && out.length < limit; d++) {
    for (const open of openSpans(addDays(q.fromDay, d), q.hours, q.timeZone)) {
      for (let t = open.start.getTime(); t + length <= open.end.getTime() && out.length < limit; t += step) {
        if (t < q.now.getTime()) continue;
        const span = { start: new Date(t), end: new Date(t + length) };
        if (!busy.some((b) => overlaps(span, b))) out.push(span.start);
      }
    }
  }
  return out;
}
