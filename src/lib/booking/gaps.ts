import type { Span } from './slots';

/**
 * The free stretches of at least `minMinutes` inside the open spans once the taken spans are
 * removed, e.g. open 08:00–12:00 with 09:00–10:00 taken → 08:00–09:00 and 10:00–12:00.
 */
export function freeGaps(open: readonly Span[], taken: readonly Span[], minMinutes = 15): Span[] {
  const sorted = [...taken].sort((a, b) => a.start.getTime() - b.start.getTime());
  const out: Span[] = [];
  for (const o of open) {
    let cursor = o.start.getTime();
    for (const t of sorted) {
      if (t.end.getTime() <= cursor || t.start.getTime() >= o.end.getTime()) continue;
      if (t.start.getTime() > cursor) out.push({ start: new Date(cursor), end: new Date(Math.min(t.start.getTime(), o.end.getTime())) });
      cursor = Math.max(cursor, t.end.getTime());
    }
    if (cursor < o.end.getTime()) out.push({ start: new Date(cursor), end: o.end });
  }
  return out.filter((g) => g.end.getTime() - g.start.getTime() >= minMinutes * 60_000);
}
