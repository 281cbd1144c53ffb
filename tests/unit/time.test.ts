import { describe, expect, it } from 'vitest';
import { addDays, ageOn, dayClock, zonedClock, zonedDate, zonedDayRange, zonedTimeToUtc } from '../../src/lib/time';

const CHI = 'America/Chicago';

describe('zonedTimeToUtc', () => {
  it('maps clinic wall-clock time to UTC in winter and summer', () => {
    expect(zonedTimeToUtc('2026-12-02', 9, 0, CHI).toISOString()).toBe('2026-12-02T15:00:00.000Z'); // CST = UTC−6
    expect(zonedTimeToUtc('2026-07-02', 9, 0, CHI).toISOString()).toBe('2026-07-02T14:00:00.000Z'); // CDT = UTC−5
    expect(zonedTimeToUtc('2026-07-02', 9, 30, 'Asia/Kolkata').toISOString()).toBe('2026-07-02T04:00:00.000Z');
  });
  it('handles the spring-forward gap and the autumn overlap', () => {
    // 2026-03-08 02:30 does not exist in Chicago; it lands one hour later on the clock.
    expect(zonedClock(zonedTimeToUtc('2026-03-08', 2, 30, CHI), CHI)).toBe('03:30');
    // 2026-11-01 01:30 happens twice; the first (CDT) is chosen.
    expect(zonedTimeToUtc('2026-11-01', 1, 30, CHI).toISOString()).toBe('2026-11-01T06:30:00.000Z');
  });
});

describe('zonedDayRange', () => {
  it('is 24 hours on a normal day, 23 on spring-forward day and 25 on fall-back day', () => {
    const hours = (d: string) => {
      const { start, end } = zonedDayRange(d, CHI);
      return (end.getTime() - start.getTime()) / 3_600_000;
    };
    expect(hours('2026-12-02')).toBe(24);
    expect(hours('2026-03-08')).toBe(23);
    expect(hours('2026-11-01')).toBe(25);
  });
  it('puts a late-evening instant on the clinic day, not the UTC day', () => {
    const instant = new Date('2026-12-02T04:30:00Z'); // 22:30 on 1 December in Chicago
    expect(zonedDate(instant, CHI)).toBe('2026-12-01');
    const { start, end } = zonedDayRange('2026-12-01', CHI);
    expect(instant >= start && instant < end).toBe(true);
  });
});

describe('addDays and ageOn', () => {
  it('crosses month and year ends', () => {
    expect(addDays('2026-12-31', 1)).toBe('2027-01-01');
    expect(addDays('2028-03-01', -1)).toBe('2028-02-29');
  });
  it('counts whole years, the birthday itself included', () => {
    expect(ageOn('1980-06-15', '2026-06-14')).toBe(45);
    expect(ageOn('1980-06-15', '2026-06-15')).toBe(46);
    expect(ageOn('2000-02-29', '2027-02-28')).toBe(26);
    expect(ageOn('2000-02-29', '2027-03-01')).toBe(27);
  });
});

describe('dayClock', () => {
  it('agrees with zonedClock on ordinary days and on clock-change days', () => {
    for (const day of ['2026-12-02', '2026-03-08', '2026-11-01', '2026-07-15']) {
      const clock = dayClock(day, CHI);
      const { start } = zonedDayRange(day, CHI);
      for (let m = 0; m < 24 * 60; m += 7) {
        const t = new Date(start.getTime() + m * 60_000);
        expect(clock(t), `${day} +${m} min`).toBe(zonedClock(t, CHI));
      }
    }
  });
});
