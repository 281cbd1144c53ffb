/**
 * Reading the one search box of the patient list. The text is taken, in this order, as:
 *
 * 1. an MRN: "P" and seven digits, any case ("p0000012" → "P0000012"), matched exactly;
 * 2. a birth date, in one of these forms (day before month whenever the month is a number):
 *    - ISO: 1980-03-12, also 1980/03/12 or 1980.3.12
 *    - day first: 12/03/1980, 12.03.1980, 12-03-1980, 12/3/1980
 *    - with the month named: 12 Mar 1980, 12 March 1980, March 12, 1980
 *    A year must have four digits; a form that looks like a date but is not a calendar date
 *    (31/02/1980) or has a two-digit year is reported as such rather than searched as a name;
 * 3. otherwise name words: each word must start the family name or the given name
 *    ("ali mor" finds "Morgan, Alice"; commas are ignored, so "Morgan, Alice" works too).
 */
export type PatientSearch =
  | { kind: 'all' }
  | { kind: 'mrn'; mrn: string }
  | { kind: 'birthDate'; birthDate: string }
  | { kind: 'invalidDate'; reason: string }
  | { kind: 'name'; words: string[] };

/** At most this many name words are used; more rarely narrows anything. */
export const MAX_NAME_WORDS = 4;

const MONTHS = ['january', 'february', 'march', 'april', 'may', 'june', 'july', 'august', 'september', 'october', 'november', 'december'];

/** Month number (1–12) of an English month name or an abbreviation of 3+ letters, e.g. "Sept" → 9. */
function monthNumber(word: string): number | undefined {
  const w = word.toLowerCase().replace(/\.$/, '');
  if (w.length < 3) return undefined;
  const i = MONTHS.findIndex((m) => m.startsWith(w));
  return i >= 0 ? i + 1 : undefined;
}

/** True for a real calendar date, e.g. isCalendarDate(1980, 2, 29) → true, (1981, 2, 29) → false. */
export function isCalendarDate(year: number, month: number, day: number): boolean {
  if (month < 1 || month > 12 || day < 1) return false;
  const d = new Date(Date.UTC(year, month - 1, day));
  return d.getUTCFullYear() === year && d.getUTCMonth() === month - 1 && d.getUTCDate() === day;
}

function isoOf(year: number, month: number, day: number): PatientSearch {
  if (!isCalendarDate(year, month, day)) return { kind: 'invalidDate', reason: 'This is not a calendar date.' };
  return { kind: 'birthDate', birthDate: `${year}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}` };
}

const ISO = /^(\d{4})[-/.](\d{1,2})[-/.](\d{1,2})$/;
const DAY_FIRST = /^(\d{1,2})[-/.](\d{1,2})[-/.](\d{4})$/;
const SHORT_YEAR = /^\d{1,2}[-/.]\d{1,2}[-/.]\d{2}$/;
const DAY_MONTH_NAME = /^(\d{1,2})\.?\s+([a-z]+\.?),?\s+(\d{4})$/i;
const MONTH_NAME_DAY = /^([a-z]+\.?)\s+(\d{1,2}),?\s+(\d{4})$/i;

/**
 * What the patient search box means, e.g. parsePatientSearch('12/03/1980') →
 * { kind: 'birthDate', birthDate: '1980-03-12' }.
 */
export function parsePatientSearch(text: string | undefined | null): PatientSearch {
  const t = (text ?? '').trim().replace(/\s+/g, ' ');
  if (t === '') return { kind: 'all' };
  if (/^p\d{7}$/i.test(t)) return { kind: 'mrn', mrn: t.toUpperCase() };

  let m = ISO.exec(t);
  if (m) return isoOf(Number(m[1]), Number(m[2]), Number(m[3]));
  m = DAY_FIRST.exec(t);
  if (m) return isoOf(Number(m[3]), Number(m[2]), Number(m[1]));
  if (SHORT_YEAR.test(t)) return { kind: 'invalidDate', reason: 'Write the year with four digits.' };
  m = DAY_MONTH_NAME.exec(t);
  if (m && monthNumber(m[2]!)) return isoOf(Number(m[3]), monthNumber(m[2]!)!, Number(m[1]));
  m = MONTH_NAME_DAY.exec(t);
  if (m && monthNumber(m[1]!)) return isoOf(Number(m[3]), monthNumber(m[1]!)!, Number(m[2]));

  const words = t
    .split(/[\s,;]+/)
    .filter((w) => w !== '')
    .slice(0, MAX_NAME_WORDS);
  return words.length ? { kind: 'name', words } : { kind: 'all' };
}

/** A short line saying how the search was read, for the list's status line. */
export function describePatientSearch(search: PatientSearch): string {
  switch (search.kind) {
    case 'all':
      return 'All patients';
    case 'mrn':
      return `MRN ${search.mrn}`;
    case 'birthDate':
      return `Born ${formatIsoDate(search.birthDate)}`;
    case 'invalidDate':
      return search.reason;
    case 'name':
      return `Names starting with ${search.words.map((w) => `“${w}”`).join(' and ')}`;
  }
}

const isoDateFormat = new Intl.DateTimeFormat('en-GB', { timeZone: 'UTC', day: 'numeric', month: 'short', year: 'numeric' });

/** A calendar date for people, e.g. formatIsoDate('1980-03-12') → "12 Mar 1980". */
export function formatIsoDate(iso: string): string {
  const [y, m, d] = iso.split('-').map(Number) as [number, number, number];
  return isoDateFormat.format(new Date(Date.UTC(y, m - 1, d)));
}
