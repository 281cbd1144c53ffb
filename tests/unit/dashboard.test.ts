import { describe, expect, it } from 'vitest';
import { csvCell, csvField, csvFileName, toCsv } from '../../src/lib/dashboard/csv';
import { formatMinutes } from '../../src/lib/dashboard/format';
import { percentile, percentileOfCounts, roundedMinutes } from '../../src/lib/dashboard/percentile';
import { isCalendarDate, offsetSegments, periodDays, presetPeriod } from '../../src/lib/dashboard/period';
import { openMinutesPerRoom, ratePercent } from '../../src/lib/dashboard/utilisation';
import { dashboardExportSchema, dashboardPeriodSchema } from '../../src/lib/schemas/dashboard';
import { DEFAULT_CLINIC_HOURS } from '../../src/lib/schemas/settings';
import { zonedDayRange } from '../../src/lib/time';

describe('percentile (linear between closest ranks: rank = 1 + p(n − 1))', () => {
  it('interpolates between the two closest ranks', () => {
    // [1, 2, 3, 4]: median at rank 2.5 → 2.5; p90 at rank 3.7 → 3 + 0.7 × (4 − 3) = 3.7 (worked out by hand).
    expect(percentile([4, 1, 3, 2], 0.5)).toBe(2.5);
    expect(percentile([4, 1, 3, 2], 0.9)).toBeCloseTo(3.7, 10);
    // [15, 20, 35, 40, 50]: p90 at rank 4.6 → 40 + 0.6 × 10 = 46 (numpy.percentile gives 46 too).
    expect(percentile([15, 20, 35, 40, 50], 0.9)).toBeCloseTo(46, 10);
    expect(percentile([15, 20, 35, 40, 50], 0.5)).toBe(35);
  });
  it('answers null for no values and the value itself for one', () => {
    expect(percentile([], 0.5)).toBeNull();
    expect(percentile([7], 0.9)).toBe(7);
  });
  it('reads counted values as if each were listed', () => {
    // 10, 10, 10, 40: median at rank 2.5 → 10; p90 at rank 3.7 → 10 + 0.7 × 30 = 31 (by hand).
    expect(percentileOfCounts([[40, 1], [10, 3]], 0.5)).toBe(10);
    expect(percentileOfCounts([[40, 1], [10, 3]], 0.9)).toBeCloseTo(31, 10);
    expect(percentileOfCounts([[5, 0]], 0.5)).toBeNull();
    expect(() => percentileOfCounts([[1, 1]], 1.5)).toThrow(RangeError);
  });
});

describe('roundedMinutes (the precision the dashboard shows)', () => {
  it('rounds to the minute below 2 hours, to 6 minutes below 2 days, to the hour beyond; half-way up', () => {
    expect(roundedMinutes(89)).toBe(1); // 1 min 29 s
    expect(roundedMinutes(90)).toBe(2); // 1 min 30 s rounds up
    expect(roundedMinutes(7_199)).toBe(120);
    expect(roundedMinutes(7_200)).toBe(120);
    expect(roundedMinutes(3 * 3_600 + 200)).toBe(186); // 3 h 3 min 20 s → 3.1 h
    expect(roundedMinutes(172_800)).toBe(2_880);
    expect(roundedMinutes(3 * 86_400 + 1_799)).toBe(4_320); // 3 days 29 min 59 s → 72 h
  });
  it('is shown in the same steps', () => {
    expect(formatMinutes(45)).toBe('45 min');
    expect(formatMinutes(186)).toBe('3.1 h');
    expect(formatMinutes(4_320)).toBe('3.0 days');
    expect(formatMinutes(null)).toBe('—');
  });
});

describe('CSV', () => {
  it('quotes only what needs quoting, doubling quotes', () => {
    expect(csvField('Room 1')).toBe('Room 1');
    expect(csvField('Room 2, east')).toBe('"Room 2, east"');
    expect(csvField('the "new" room')).toBe('"the ""new"" room"');
    expect(csvField('two\nlines')).toBe('"two\nlines"');
    expect(csvField(' edge')).toBe('" edge"');
  });
  it('keeps a spreadsheet from running text as a formula, but writes negative numbers as numbers', () => {
    expect(csvCell('=HYPERLINK("x")', 'text')).toBe('"\'=HYPERLINK(""x"")"');
    expect(csvCell('-room', 'text')).toBe("'-room");
    expect(csvCell(-5_000, 'money')).toBe('-50.00');
    expect(csvCell(12_345, 'money')).toBe('123.45');
    expect(csvCell(6.3, 'percent')).toBe('6.3');
    expect(csvCell(null, 'minutes')).toBe('');
  });
  it('writes a header of labels and CRLF lines, UTF-8 with no byte-order mark', () => {
    const csv = toCsv({
      columns: [
        { key: 'room', label: 'Room', kind: 'text' },
        { key: 'minutes', label: 'Booked (minutes)', kind: 'count' },
      ],
      rows: [{ room: 'Sala Ñandú', minutes: 90 }, { room: 'All rooms', minutes: 90 }],
    });
    expect(csv).toBe('Room,Booked (minutes)\r\nSala Ñandú,90\r\nAll rooms,90\r\n');
    expect(csv.charCodeAt(0)).not.toBe(0xfeff);
    expect(csvFileName('rooms', '2026-11-30', '2026-12-06')).toBe('crestline-rooms-2026-11-30-to-2026-12-06.csv');
  });
});

describe('periods', () => {
  it('names this week (Monday to Sunday), the last 30 days and this month', () => {
    expect(presetPeriod('week', '2026-12-03')).toEqual({ from: '2026-11-30', to: '2026-12-06' }); // a Thursday
    expect(presetPeriod('week', '2026-12-06')).toEqual({ from: '2026-11-30', to: '2026-12-06' }); // its Sunday
    expect(presetPeriod('last-30', '2026-12-03')).toEqual({ from: '2026-11-04', to: '2026-12-03' });
    expect(presetPeriod('month', '2026-02-14')).toEqual({ from: '2026-02-01', to: '2026-02-28' });
    expect(presetPeriod('month', '2028-02-10')).toEqual({ from: '2028-02-01', to: '2028-02-29' });
    expect(presetPeriod('month', '2026-12-31')).toEqual({ from: '2026-12-01', to: '2026-12-31' });
  });
  it('counts days with both ends included and knows real dates', () => {
    expect(periodDays('2026-01-01', '2026-12-31')).toBe(365);
    expect(periodDays('2028-01-01', '2028-12-31')).toBe(366);
    expect(isCalendarDate('2026-02-30')).toBe(false);
    expect(isCalendarDate('2026-2-3')).toBe(false);
  });
  it('checks a period: dates in order, at most 366 days', () => {
    expect(dashboardPeriodSchema.safeParse({ from: '2028-01-01', to: '2028-12-31' }).success).toBe(true);
    const backwards = dashboardPeriodSchema.safeParse({ from: '2026-12-10', to: '2026-12-01' });
    expect(backwards.success ? null : backwards.error.issues[0]!.path).toEqual(['to']);
    expect(dashboardPeriodSchema.safeParse({ from: '2026-01-01', to: '2027-01-02' }).success).toBe(false); // 367 days
    expect(dashboardPeriodSchema.safeParse({ from: '2026-02-30', to: '2026-03-01' }).success).toBe(false);
    expect(dashboardExportSchema.safeParse({ table: 'patients', from: '2026-01-01', to: '2026-01-02' }).success).toBe(false);
    expect(dashboardExportSchema.safeParse({ table: 'rooms', from: '2026-01-01', to: '2027-01-05' }).success).toBe(false);
  });
  it('splits the clinic offset where daylight saving changes', () => {
    // Chicago falls back at 02:00 CDT on 1 Nov 2026 (07:00 UTC): −300 before, −360 after.
    const autumn = offsetSegments(zonedDayRange('2026-10-31', 'America/Chicago').start, zonedDayRange('2026-11-02', 'America/Chicago').end, 'America/Chicago');
    expect(autumn).toEqual([{ until: new Date('2026-11-01T07:00:00Z'), offsetMinutes: -300 }, { until: null, offsetMinutes: -360 }]);
    // And springs forward at 02:00 CST on 8 Mar 2026 (08:00 UTC).
    const spring = offsetSegments(zonedDayRange('2026-03-01', 'America/Chicago').start, zonedDayRange('2026-03-31', 'America/Chicago').end, 'America/Chicago');
    expect(spring).toEqual([{ until: new Date('2026-03-08T08:00:00Z'), offsetMinutes: -360 }, { until: null, offsetMinutes: -300 }]);
    expect(offsetSegments(new Date('2026-06-01T00:00:00Z'), new Date('2026-06-08T00:00:00Z'), 'UTC')).toEqual([{ until: null, offsetMinutes: 0 }]);
  });
});

describe('utilisation', () => {
  it('counts open minutes from the weekly hours and closed dates', () => {
    // Mon 7 – Sun 13 Dec 2026: five days of 08:00–17:00 (540 min) and Saturday 08:00–12:00 (240) = 2,940.
    expect(openMinutesPerRoom({ from: '2026-12-07', to: '2026-12-13' }, DEFAULT_CLINIC_HOURS)).toBe(2_940);
    expect(openMinutesPerRoom({ from: '2026-12-07', to: '2026-12-13' }, { ...DEFAULT_CLINIC_HOURS, closedDates: ['2026-12-08'] })).toBe(2_400);
  });
  it('gives shares in percent with one decimal', () => {
    expect(ratePercent(1, 3)).toBe(33.3);
    expect(ratePercent(1, 16)).toBe(6.3); // 6.25 rounds up
    expect(ratePercent(0, 0)).toBeNull();
  });
});
