/**
 * Percentiles of turnaround times, as the clinic dashboard states them.
 *
 * Definition (Hyndman & Fan type 7, the one of MariaDB's PERCENTILE_CONT, Excel's PERCENTILE.INC
 * and numpy's default): sort the n values; the p-th percentile sits at rank r = 1 + p·(n − 1);
 * when r falls between two ranks, it is the linear interpolation between their two values.
 * The median is p = 0.5, the 90th percentile p = 0.9.
 *
 * Each time is first rounded to the precision the dashboard shows it in (`roundedMinutes`), and
 * the database answers with how many exams took each rounded time: the percentile is taken over
 * that small set of counts, never over every exam. (PERCENTILE_CONT itself, as a window function
 * over a year of exams, took 0.4–0.9 s; the counts take a fraction of that.)
 */

/**
 * A duration in seconds rounded to the precision shown: whole minutes below 2 hours, tenths of an
 * hour (6 minutes) below 2 days, whole hours beyond; half-way rounds up. The SQL of the dashboard
 * service does the same with integer division.
 *
 * @example roundedMinutes(89) → 1; roundedMinutes(3 * 3600 + 200) → 186; roundedMinutes(3 * 86400 + 1799) → 4320
 */
export function roundedMinutes(seconds: number): number {
  if (seconds < 7_200) return Math.floor((seconds + 30) / 60);
  if (seconds < 172_800) return Math.floor((seconds + 180) / 360) * 6;
  return Math.floor((seconds + 1_800) / 3_600) * 60;
}

/** The p-th percentile (0 ≤ p ≤ 1) of values, by the definition above; null when there are none. */
export function percentile(values: readonly number[], p: number): number | null {
  return percentileOfCounts(values.map((v) => [v, 1] as const), p);
}

/**
 * The p-th percentile of values given as [value, how many] pairs (in any order), by the
 * definition above; null when the counts add up to nothing.
 *
 * @example percentileOfCounts([[10, 3], [40, 1]], 0.5) → 10 (rank 2.5 of 10, 10, 10, 40)
 */
export function percentileOfCounts(counts: ReadonlyArray<readonly [value: number, count: number]>, p: number): number | null {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`A percentile is asked for with p between 0 and 1, not ${p}.`);
  const sorted = counts.filter(([, n]) => n > 0).sort((a, b) => a[0] - b[0]);
  const total = sorted.reduce((sum, [, n]) => sum + n, 0);
  if (total === 0) return null;
  const h = p * (total - 1); // zero-based rank
  const lower = Math.floor(h);
  const below = valueAtRank(sorted, lower);
  const fraction = h - lower;
  return fraction === 0 ? below : below + fraction * (valueAtRank(sorted, lower + 1) - below);
}

/** The value at a zero-based rank of the counted values (sorted ascending). */
function valueAtRank(sorted: ReadonlyArray<readonly [number, number]>, rank: number): number {
  let seen = 0;
  for (const [value, n] of sorted) {
    seen += n;
    if (rank < seen) return value;
  }
  return sorted[sorted.length - 1]![0];
}
