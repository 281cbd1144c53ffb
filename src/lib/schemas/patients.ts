import { z } from 'zod';
import { SEXES, type ExamStatus, type Sex } from '../exam-status';
import { isCalendarDate, type PatientSearch } from './patient-search';

export const SEX_LABELS: Record<Sex, string> = { female: 'Female', male: 'Male', other: 'Other', unknown: 'Unknown' };

/** The earliest birth date accepted. */
export const EARLIEST_BIRTH_DATE = '1900-01-01';

/**
 * The newest calendar date anywhere on Earth (UTC+14), e.g. "2026-12-03" while it is still
 * 2026-12-02 in the clinic. A birth date after it is in the future wherever the browser or
 * server happens to be; a baby born today is never refused because of a time-zone gap.
 */
export function latestCalendarDate(now = new Date()): string {
  return new Date(now.getTime() + 14 * 3_600_000).toISOString().slice(0, 10);
}

// Letters of any script, combining marks, spaces, hyphens, apostrophes and full stops
// ("O'Brien", "Nguyễn", "St. John", "Smith-Jones"); no digits or symbols.
const NAME_CHARS = /^[\p{L}\p{M}][\p{L}\p{M} '’.-]*$/u;

const personName = (what: string) =>
  z
    .string()
    .trim()
    .min(1, `Enter the ${what}.`)
    .max(100, 'Use at most 100 characters.')
    .regex(NAME_CHARS, 'Use letters, spaces, hyphens and apostrophes only.')
    .transform((v) => v.replace(/\s+/g, ' '));

/** A birth date as YYYY-MM-DD: a real calendar date, not before 1900, not in the future. */
export const birthDateSchema = z
  .string()
  .trim()
  .min(1, 'Enter the birth date.')
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Enter the date as YYYY-MM-DD.')
  .refine((v) => {
    const [y, m, d] = v.split('-').map(Number) as [number, number, number];
    return isCalendarDate(y, m, d);
  }, 'This is not a calendar date.')
  .refine((v) => v >= EARLIEST_BIRTH_DATE, 'Birth dates before 1900 are not accepted.')
  .refine((v) => v <= latestCalendarDate(), 'A birth date cannot be in the future.');

const phone = z
  .string()
  .trim()
  .min(1, 'Enter a phone number.')
  .max(40, 'Use at most 40 characters.')
  .regex(/^\+?[0-9 ().-]+$/, 'Use digits, spaces and + ( ) - only.')
  .refine((v) => v.replace(/\D/g, '').length >= 5, 'A phone number has at least 5 digits.');

const requiredText = (what: string, max: number) =>
  z.string().trim().min(1, `Enter the ${what}.`).max(max, `Use at most ${max} characters.`);

/** Optional e-mail: an empty field is stored as no address (null). */
const optionalEmail = z
  .string()
  .trim()
  .toLowerCase()
  .max(254, 'Use at most 254 characters.')
  .refine((v) => v === '' || z.email().safeParse(v).success, 'Enter a valid e-mail address, or leave it empty.')
  .nullish()
  .transform((v) => v || null);

/** The fields of a patient record the front desk fills in; the same schema drives form and endpoint. */
export const patientFieldsSchema = z.object({
  familyName: personName('family name'),
  givenName: personName('given name'),
  birthDate: birthDateSchema,
  sex: z.enum(SEXES, { message: 'Choose one.' }),
  email: optionalEmail,
  phone,
  addressLine: requiredText('address', 200),
  city: requiredText('city', 100),
  postalCode: requiredText('postal code', 20).regex(/^[\p{L}\p{N} -]+$/u, 'Use letters, digits, spaces and hyphens only.'),
});
export type PatientFields = z.infer<typeof patientFieldsSchema>;
export type PatientFormValues = z.input<typeof patientFieldsSchema>;
export const PATIENT_FIELDS = Object.keys(patientFieldsSchema.shape) as Array<keyof PatientFields>;

/** A new patient; `confirmedNotDuplicate` is the person's deliberate "this is someone else". */
export const createPatientSchema = patientFieldsSchema.extend({
  confirmedNotDuplicate: z.boolean().optional(),
});
export type CreatePatientInput = z.infer<typeof createPatientSchema>;

/** A change to a patient; `version` is the one the person saw, for stale-edit detection. */
export const updatePatientSchema = patientFieldsSchema
  .partial()
  .extend({ version: z.number().int().min(0), confirmedNotDuplicate: z.boolean().optional() })
  .refine((v) => PATIENT_FIELDS.some((k) => v[k] !== undefined), { message: 'Nothing to change.' });
export type UpdatePatientInput = z.infer<typeof updatePatientSchema>;

export const patientListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(20),
  sort: z.enum(['name', 'mrn', 'birthDate', 'createdAt']).default('name'),
  dir: z.enum(['asc', 'desc']).default('asc'),
  q: z.string().trim().max(100, 'Use at most 100 characters.').optional(),
});
export type PatientListQuery = z.infer<typeof patientListQuerySchema>;

/**
 * Who might already have a record: same family and given name and birth date, or the same
 * MRN (e.g. read from a card the patient brings). `excludeId` leaves out the record being edited.
 */
export const duplicateQuerySchema = z
  .object({
    familyName: z.string().trim().max(100).optional(),
    givenName: z.string().trim().max(100).optional(),
    birthDate: z.string().trim().max(10).optional(),
    mrn: z.string().trim().toUpperCase().regex(/^P\d{7}$/, 'An MRN is P and seven digits.').optional(),
    excludeId: z.coerce.number().int().positive().optional(),
  })
  .superRefine((v, ctx) => {
    const byName = v.familyName || v.givenName || v.birthDate;
    if (!byName && !v.mrn) {
      ctx.addIssue({ code: 'custom', path: ['familyName'], message: 'Give the names and birth date, or an MRN.' });
      return;
    }
    if (!byName) return;
    if (!v.familyName) ctx.addIssue({ code: 'custom', path: ['familyName'], message: 'Enter the family name.' });
    if (!v.givenName) ctx.addIssue({ code: 'custom', path: ['givenName'], message: 'Enter the given name.' });
    const date = birthDateSchema.safeParse(v.birthDate ?? '');
    if (!date.success) ctx.addIssue({ code: 'custom', path: ['birthDate'], message: date.error.issues[0]!.message });
  });
export type DuplicateQuery = z.infer<typeof duplicateQuerySchema>;

export const patientIdParamsSchema = z.object({ id: z.coerce.number().int().positive('Not a valid id.') });

/** A patient as the list and the duplicate warning show them. */
export interface PatientSummary {
  id: number;
  mrn: string;
  familyName: string;
  givenName: string;
  birthDate: string;
  sex: Sex;
  city: string | null;
}

/** A whole patient record, as the record page and the edit form use it. */
export interface PatientRecord extends PatientSummary {
  email: string | null;
  phone: string | null;
  addressLine: string | null;
  postalCode: string | null;
  version: number;
}

export interface PatientListResult {
  rows: PatientSummary[];
  total: number;
  /** How the search text was read (MRN, birth date, name words). */
  search: PatientSearch;
}

/** One exam on a patient's record, with date and time already in the clinic's time zone. */
export interface PatientExamRow {
  id: number;
  accessionNumber: string;
  date: string;
  time: string;
  examType: string;
  room: string;
  status: ExamStatus;
}

/** "Family, Given", e.g. patientName({ familyName: 'Morgan', givenName: 'Alice' }) → "Morgan, Alice". */
export function patientName(p: { familyName: string; givenName: string }): string {
  return `${p.familyName}, ${p.givenName}`;
}
