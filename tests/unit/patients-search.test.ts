import { describe, expect, it } from 'vitest';
import { describePatientSearch, formatIsoDate, isCalendarDate, parsePatientSearch } from '../../src/lib/schemas/patient-search';

describe('parsePatientSearch', () => {
  it('reads nothing as "all patients"', () => {
    expect(parsePatientSearch('')).toEqual({ kind: 'all' });
    expect(parsePatientSearch('   ')).toEqual({ kind: 'all' });
    expect(parsePatientSearch(undefined)).toEqual({ kind: 'all' });
    expect(parsePatientSearch(' , ')).toEqual({ kind: 'all' });
  });

  it('reads P and seven digits as an MRN, in any case', () => {
    expect(parsePatientSearch('P0000012')).toEqual({ kind: 'mrn', mrn: 'P0000012' });
    expect(parsePatientSearch(' p0000012 ')).toEqual({ kind: 'mrn', mrn: 'P0000012' });
  });

  it('does not take a near-MRN for one', () => {
    expect(parsePatientSearch('P000012').kind).toBe('name');
    expect(parsePatientSearch('P00000123').kind).toBe('name');
  });

  it('reads ISO dates', () => {
    expect(parsePatientSearch('1980-03-12')).toEqual({ kind: 'birthDate', birthDate: '1980-03-12' });
    expect(parsePatientSearch('1980/3/2')).toEqual({ kind: 'birthDate', birthDate: '1980-03-02' });
    expect(parsePatientSearch('1980.03.12')).toEqual({ kind: 'birthDate', birthDate: '1980-03-12' });
  });

  it('reads numeric dates day first', () => {
    expect(parsePatientSearch('12/03/1980')).toEqual({ kind: 'birthDate', birthDate: '1980-03-12' });
    expect(parsePatientSearch('12.03.1980')).toEqual({ kind: 'birthDate', birthDate: '1980-03-12' });
    expect(parsePatientSearch('12-3-1980')).toEqual({ kind: 'birthDate', birthDate: '1980-03-12' });
    expect(parsePatientSearch('2/11/1980')).toEqual({ kind: 'birthDate', birthDate: '1980-11-02' });
  });

  it('reads dates with a month name in either order', () => {
    expect(parsePatientSearch('12 Mar 1980')).toEqual({ kind: 'birthDate', birthDate: '1980-03-12' });
    expect(parsePatientSearch('12 march 1980')).toEqual({ kind: 'birthDate', birthDate: '1980-03-12' });
    expect(parsePatientSearch('March 12, 1980')).toEqual({ kind: 'birthDate', birthDate: '1980-03-12' });
    expect(parsePatientSearch('Sept. 1 1999')).toEqual({ kind: 'birthDate', birthDate: '1999-09-01' });
  });

  it('reports a date that is not on the calendar, or has a two-digit year, instead of searching names', () => {
    expect(parsePatientSearch('31/02/1980')).toEqual({ kind: 'invalidDate', reason: 'This is not a calendar date.' });
    expect(parsePatientSearch('1981-02-29').kind).toBe('invalidDate');
    expect(parsePatientSearch('12/13/1980').kind).toBe('invalidDate');
    expect(parsePatientSearch('12/03/80')).toEqual({ kind: 'invalidDate', reason: 'Write the year with four digits.' });
  });

  it('reads anything else as name words, at most four', () => {
    expect(parsePatientSearch('ali mor')).toEqual({ kind: 'name', words: ['ali', 'mor'] });
    expect(parsePatientSearch('Morgan, Alice')).toEqual({ kind: 'name', words: ['Morgan', 'Alice'] });
    expect(parsePatientSearch("  o'brien   ")).toEqual({ kind: 'name', words: ["o'brien"] });
    expect(parsePatientSearch('a b c d e f')).toEqual({ kind: 'name', words: ['a', 'b', 'c', 'd'] });
    // A month name alone, or a name that happens to be one, is a name.
    expect(parsePatientSearch('May')).toEqual({ kind: 'name', words: ['May'] });
    expect(parsePatientSearch('June Carter')).toEqual({ kind: 'name', words: ['June', 'Carter'] });
  });

  it('keeps LIKE wildcards as plain text (the service escapes them)', () => {
    expect(parsePatientSearch('50%_x')).toEqual({ kind: 'name', words: ['50%_x'] });
  });
});

describe('isCalendarDate', () => {
  it('knows leap years', () => {
    expect(isCalendarDate(2000, 2, 29)).toBe(true);
    expect(isCalendarDate(1900, 2, 29)).toBe(false);
    expect(isCalendarDate(1980, 4, 31)).toBe(false);
    expect(isCalendarDate(1980, 0, 1)).toBe(false);
  });
});

describe('describePatientSearch', () => {
  it('says how the text was read', () => {
    expect(describePatientSearch(parsePatientSearch('12/03/1980'))).toBe('Born 12 Mar 1980');
    expect(describePatientSearch(parsePatientSearch('p0000012'))).toBe('MRN P0000012');
    expect(describePatientSearch(parsePatientSearch('ali mor'))).toBe('Names starting with “ali” and “mor”');
    expect(formatIsoDate('2004-11-02')).toBe('2 Nov 2004');
  });
});
