import { describe, expect, it } from 'vitest';
import { ageInYears, daysBetween, parseIsoDate } from '@/lib/clinical';

const d = (text: string) => {
  const parsed = parseIsoDate(text);
  if (parsed === null) throw new Error(`bad date ${text}`);
  return parsed;
};

describe('parseIsoDate', () => {
  it('accepts calendar dates only', () => {
    expect(parseIsoDate('2024-02-29')).toEqual({ year: 2024, month: 2, day: 29 });
    expect(parseIsoDate('2023-02-29')).toBeNull();
    expect(parseIsoDate('2025-13-01')).toBeNull();
    expect(parseIsoDate('2025-04-31')).toBeNull();
    expect(parseIsoDate('2025-1-01')).toBeNull();
    expect(parseIsoDate('2025-01-01T10:00:00Z')).toBeNull();
  });
});

describe('ageInYears', () => {
  it('counts completed years', () => {
    expect(ageInYears(d('1970-06-15'), d('2025-06-14'))).toBe(54);
    expect(ageInYears(d('1970-06-15'), d('2025-06-15'))).toBe(55);
  });

  it('reaches a 29 February birthday on 1 March in common years', () => {
    expect(ageInYears(d('2000-02-29'), d('2018-02-28'))).toBe(17);
    expect(ageInYears(d('2000-02-29'), d('2018-03-01'))).toBe(18);
    expect(ageInYears(d('2000-02-29'), d('2020-02-29'))).toBe(20);
  });
});

describe('daysBetween', () => {
  it('counts calendar days across leap years and centuries', () => {
    expect(daysBetween(d('2024-01-01'), d('2024-12-31'))).toBe(365);
    expect(daysBetween(d('2023-01-01'), d('2024-01-01'))).toBe(365);
    expect(daysBetween(d('2024-01-01'), d('2025-01-01'))).toBe(366);
    expect(daysBetween(d('1900-02-28'), d('1900-03-01'))).toBe(1);
    expect(daysBetween(d('2000-02-28'), d('2000-03-01'))).toBe(2);
    expect(daysBetween(d('2025-03-01'), d('2024-03-01'))).toBe(-365);
  });
});
