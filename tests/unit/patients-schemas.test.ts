import { describe, expect, it } from 'vitest';
import { fieldErrors } from '../../src/lib/field-errors';
import {
  createPatientSchema,
  duplicateQuerySchema,
  latestCalendarDate,
  patientFieldsSchema,
  patientListQuerySchema,
  updatePatientSchema,
} from '../../src/lib/schemas/patients';
import { referrerFieldsSchema, referrerListQuerySchema, updateReferrerSchema } from '../../src/lib/schemas/referrers';
import { addDays } from '../../src/lib/time';

const alice = {
  familyName: ' Morgan ',
  givenName: 'Alice  Jane',
  birthDate: '1980-03-12',
  sex: 'female',
  email: '',
  phone: '+1 555 0199 001',
  addressLine: '4 Heron Row',
  city: 'Alderbrook',
  postalCode: '40917',
};

const errorsOf = (r: { success: boolean; error?: unknown }) => (r.success ? {} : fieldErrors(r.error as never));

describe('patientFieldsSchema', () => {
  it('trims names, collapses their spaces, and stores an empty e-mail as none', () => {
    const v = patientFieldsSchema.parse(alice);
    expect(v).toMatchObject({ familyName: 'Morgan', givenName: 'Alice Jane', email: null });
  });

  it('accepts names with accents, apostrophes and hyphens', () => {
    expect(patientFieldsSchema.safeParse({ ...alice, familyName: "O'Brien-Núñez", givenName: 'Zoë' }).success).toBe(true);
  });

  it('refuses digits and symbols in names', () => {
    expect(errorsOf(patientFieldsSchema.safeParse({ ...alice, familyName: 'Morgan2' }))).toHaveProperty('familyName');
    expect(errorsOf(patientFieldsSchema.safeParse({ ...alice, givenName: '<b>' }))).toHaveProperty('givenName');
  });

  it('refuses a birth date in the future', () => {
    const future = addDays(latestCalendarDate(), 1);
    expect(errorsOf(patientFieldsSchema.safeParse({ ...alice, birthDate: future }))).toEqual({ birthDate: 'A birth date cannot be in the future.' });
    expect(errorsOf(patientFieldsSchema.safeParse({ ...alice, birthDate: '2999-01-01' }))).toHaveProperty('birthDate');
  });

  it('accepts a baby born today in any time zone, and refuses anything before 1900', () => {
    expect(patientFieldsSchema.safeParse({ ...alice, birthDate: new Date().toISOString().slice(0, 10) }).success).toBe(true);
    expect(patientFieldsSchema.safeParse({ ...alice, birthDate: '1900-01-01' }).success).toBe(true);
    expect(errorsOf(patientFieldsSchema.safeParse({ ...alice, birthDate: '1899-12-31' }))).toEqual({ birthDate: 'Birth dates before 1900 are not accepted.' });
  });

  it('latestCalendarDate is the date at UTC+14', () => {
    expect(latestCalendarDate(new Date('2026-12-02T09:59:00Z'))).toBe('2026-12-02');
    expect(latestCalendarDate(new Date('2026-12-02T10:00:00Z'))).toBe('2026-12-03');
  });

  it('refuses dates that are malformed or not on the calendar', () => {
    expect(errorsOf(patientFieldsSchema.safeParse({ ...alice, birthDate: '12/03/1980' }))).toEqual({ birthDate: 'Enter the date as YYYY-MM-DD.' });
    expect(errorsOf(patientFieldsSchema.safeParse({ ...alice, birthDate: '1981-02-29' }))).toEqual({ birthDate: 'This is not a calendar date.' });
    expect(errorsOf(patientFieldsSchema.safeParse({ ...alice, birthDate: '' }))).toEqual({ birthDate: 'Enter the birth date.' });
  });

  it('knows the four sexes and nothing else', () => {
    for (const sex of ['female', 'male', 'other', 'unknown']) expect(patientFieldsSchema.safeParse({ ...alice, sex }).success).toBe(true);
    expect(errorsOf(patientFieldsSchema.safeParse({ ...alice, sex: 'f' }))).toEqual({ sex: 'Choose one.' });
  });

  it('checks e-mail and phone', () => {
    expect(errorsOf(patientFieldsSchema.safeParse({ ...alice, email: 'not-mail' }))).toHaveProperty('email');
    expect(patientFieldsSchema.parse({ ...alice, email: ' Alice@Example.TEST ' }).email).toBe('alice@example.test');
    expect(errorsOf(patientFieldsSchema.safeParse({ ...alice, phone: 'call me' }))).toHaveProperty('phone');
    expect(errorsOf(patientFieldsSchema.safeParse({ ...alice, phone: '12' }))).toHaveProperty('phone');
  });

  it('names every missing required field', () => {
    const r = patientFieldsSchema.safeParse({});
    expect(Object.keys(errorsOf(r)).sort()).toEqual(['addressLine', 'birthDate', 'city', 'familyName', 'givenName', 'phone', 'postalCode', 'sex']);
  });
});

describe('createPatientSchema and updatePatientSchema', () => {
  it('carry the deliberate duplicate confirmation', () => {
    expect(createPatientSchema.parse({ ...alice, confirmedNotDuplicate: true }).confirmedNotDuplicate).toBe(true);
    expect(createPatientSchema.safeParse({ ...alice, confirmedNotDuplicate: 'yes' }).success).toBe(false);
  });
  it('an update needs the version seen and at least one field', () => {
    expect(updatePatientSchema.safeParse({ phone: '+1 555 0100 222' }).success).toBe(false);
    expect(updatePatientSchema.safeParse({ version: 3 }).success).toBe(false);
    expect(updatePatientSchema.safeParse({ version: 3, phone: '+1 555 0100 222' }).success).toBe(true);
    expect(errorsOf(updatePatientSchema.safeParse({ version: 3, birthDate: '2999-01-01' }))).toHaveProperty('birthDate');
  });
});

describe('patient list and duplicate queries', () => {
  it('pages within bounds and sorts by known columns only', () => {
    expect(patientListQuerySchema.parse({})).toMatchObject({ page: 1, pageSize: 20, sort: 'name', dir: 'asc' });
    expect(patientListQuerySchema.safeParse({ pageSize: '500' }).success).toBe(false);
    expect(patientListQuerySchema.safeParse({ sort: 'email' }).success).toBe(false);
  });
  it('needs names and birth date together, or an MRN', () => {
    expect(duplicateQuerySchema.safeParse({}).success).toBe(false);
    expect(errorsOf(duplicateQuerySchema.safeParse({ familyName: 'Morgan', birthDate: '1980-03-12' }))).toHaveProperty('givenName');
    expect(duplicateQuerySchema.safeParse({ familyName: 'Morgan', givenName: 'Alice', birthDate: '1980-03-12' }).success).toBe(true);
    expect(duplicateQuerySchema.parse({ mrn: 'p0000012' }).mrn).toBe('P0000012');
  });
});

describe('referrer schemas', () => {
  const ward = { name: 'Dr Ada Ward', practice: 'Elm Street Family Practice', email: ' Ada.Ward@Elm.TEST ', phone: '' };
  it('normalises the e-mail and stores an empty phone as none', () => {
    expect(referrerFieldsSchema.parse(ward)).toEqual({ ...ward, email: 'ada.ward@elm.test', phone: null });
  });
  it('requires name, practice and a valid e-mail', () => {
    expect(Object.keys(errorsOf(referrerFieldsSchema.safeParse({ name: '', practice: '', email: 'x' }))).sort()).toEqual(['email', 'name', 'practice']);
  });
  it('reads active=true/false from the query string and refuses anything else', () => {
    expect(referrerListQuerySchema.parse({ active: 'true' }).active).toBe(true);
    expect(referrerListQuerySchema.parse({ active: 'false' }).active).toBe(false);
    expect(referrerListQuerySchema.parse({}).active).toBeUndefined();
    expect(referrerListQuerySchema.safeParse({ active: 'yes' }).success).toBe(false);
  });
  it('an update needs the version and a change', () => {
    expect(updateReferrerSchema.safeParse({ version: 0 }).success).toBe(false);
    expect(updateReferrerSchema.safeParse({ version: 0, active: false }).success).toBe(true);
  });
});
