// Pure calendar arithmetic on ISO dates ("YYYY-MM-DD"). No Date objects, so the result
// cannot depend on the time zone of the browser or the server.

export interface CalendarDate {
  year: number;
  month: number;
  day: number;
}

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

const isLeapYear = (year: number): boolean => (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;

function daysInMonth(year: number, month: number): number {
  if (month === 2) return isLeapYear(year) ? 29 : 28;
  return [4, 6, 9, 11].includes(month) ? 30 : 31;
}

/** Parse a strict calendar date, e.g. `parseIsoDate('2024-02-29')` → `{ year: 2024, month: 2, day: 29 }`; invalid → null. */
export function parseIsoDate(text: string): CalendarDate | null {
  const match = ISO_DATE.exec(text);
  if (match === null) return null;
  const year = Number(match[1]);
  const month = Number(match[2]);
  const day = Number(match[3]);
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return null;
  return { year, month, day };
}

/**
 * Age in completed years, e.g. `ageInYears('1970-06-15', '2025-06-14') === 54`.
 * A 29 February birthday is reached on 1 March in common years (month/day comparison).
 */
export function ageInYears(birth: CalendarDate, exam: CalendarDate): number {
  const beforeBirthday = exam.month < birth.month || (exam.month === birth.month && exam.day < birth.day);
  return exam.year - birth.year - (beforeBirthday ? 1 : 0);
}

// Days since 1970-01-01 of a proleptic Gregorian date (H. Hinnant's days_from_civil).
function dayNumber({ year, month, day }: CalendarDate): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const mp = (month + 9) % 12;
  const doy = Math.floor((153 * mp + 2) / 5) + day - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

/** Whole days from `from` to `to`, e.g. `daysBetween(2024-01-01, 2024-12-31) === 365`. */
export function daysBetween(from: CalendarDate, to: CalendarDate): number {
  return dayNumber(to) - dayNumber(from);
}

/** Average Gregorian year, used only to express an interval in years (e.g. growth per year). */
export const DAYS_PER_YEAR = 365.2425;
