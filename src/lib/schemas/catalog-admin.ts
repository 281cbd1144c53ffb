import { z } from 'zod';
import { getTemplate } from '../clinical/templates/registry';
import { PROBE_KIND_CODES } from '../exam-status';

/**
 * The clinic's catalog as the manager edits it: exam types, rooms, scanners and probes. Each
 * entity has one field schema shared by its form and its endpoints; an edit sends the whole
 * entity with the `version` it was opened with, and (de)activation is its own small request.
 */

const text = (max: number, empty: string) =>
  z.string({ message: empty }).trim().min(1, empty).max(max, `Use at most ${max} characters.`);

/** Integer cents, as the API takes them. */
const cents = z
  .number({ message: 'Enter an amount.' })
  .int('Use whole cents.')
  .min(0, 'An amount cannot be negative.')
  .max(100_000_000, 'That amount is too large.');

/**
 * "180", "180.5" or "180.50" as cents (18000, 18050, 18050); NaN when it is not an amount.
 *
 * @example centsFromText('1,250.00') → 125000
 */
export function centsFromText(value: string): number {
  const clean = value.trim().replace(/,/g, '');
  if (!/^\d+(\.\d{1,2})?$/.test(clean)) return Number.NaN;
  const [whole, part = ''] = clean.split('.');
  return Number(whole) * 100 + Number(part.padEnd(2, '0'));
}

/** Cents as the form shows them: 18000 → "180.00". */
export const textFromCents = (value: number): string => (value / 100).toFixed(2);

/** The form's money field: typed in currency units, validated and sent as cents. */
const moneyText = z
  .string()
  .transform((v, ctx) => {
    const n = centsFromText(v);
    if (Number.isNaN(n)) ctx.addIssue({ code: 'custom', message: 'Enter an amount such as 180 or 180.00.' });
    return n;
  })
  .pipe(cents);

/**
 * Runs a cross-field check whenever the fields it reads are valid, even if others are not, so
 * the manager sees every problem at once (zod skips object refinements after an invalid value).
 */
const whenValid = (...fields: string[]) => ({
  when: (payload: z.core.ParsePayload) => !payload.issues.some((i) => fields.includes(String(i.path?.[0]))),
});

const depositWithinPrice = (v: { selfPayPriceCents: number; depositCents: number }) => v.depositCents <= v.selfPayPriceCents;
const depositIssue = { path: ['depositCents'], message: 'The deposit cannot be more than the price.', ...whenValid('selfPayPriceCents', 'depositCents') };

const examTypeShape = {
  name: text(120, 'Enter the name patients and staff see.'),
  templateId: z
    .string({ message: 'Choose a report template.' })
    .refine((id) => getTemplate(id) !== undefined, 'Choose a report template Crestline has.'),
  durationMinutes: z
    .number({ message: 'Enter the duration in minutes.' })
    .int('Use whole minutes.')
    .min(5, 'An exam takes at least 5 minutes.')
    .max(240, 'An exam takes at most 240 minutes.'),
  probeKind: z.enum(PROBE_KIND_CODES, { message: 'Choose a probe kind.' }),
  preparationText: z
    .string({ message: 'Enter the preparation instructions.' })
    .trim()
    .min(2, 'Enter the preparation instructions, or "No preparation is needed."')
    .max(2000, 'Use at most 2000 characters.'),
  selfPayPriceCents: cents,
  depositCents: cents,
};

/** An exam type as the API takes it (prices in integer cents). */
export const examTypeFieldsSchema = z.object(examTypeShape).refine(depositWithinPrice, depositIssue);
export type ExamTypeFields = z.infer<typeof examTypeFieldsSchema>;

/** The same exam type as its form holds it: duration and money typed as text. */
export const examTypeFormSchema = z
  .object({
    ...examTypeShape,
    durationMinutes: z.coerce.number({ message: 'Enter the duration in minutes.' }).pipe(examTypeShape.durationMinutes),
    selfPayPriceCents: moneyText,
    depositCents: moneyText,
  })
  .refine(depositWithinPrice, depositIssue);
export type ExamTypeFormValues = z.input<typeof examTypeFormSchema>;

export const roomFieldsSchema = z.object({ name: text(80, 'Enter the room name.') });
export type RoomFields = z.infer<typeof roomFieldsSchema>;

/**
 * A DICOM application entity title (PS3.5 6.2, AE): 1–16 characters of printable ASCII, no
 * backslash; leading and trailing spaces are not significant, so they are dropped.
 */
export const aeTitleSchema = z
  .string({ message: 'Enter the AE title.' })
  .trim()
  .min(1, 'Enter the AE title the scanner calls with.')
  .max(16, 'An AE title has at most 16 characters.')
  .regex(/^[\x20-\x5b\x5d-\x7e]+$/, 'Use printable ASCII characters only, without a backslash.');

const id = (message: string) => z.coerce.number({ message }).int(message).positive(message);

export const scannerFieldsSchema = z.object({
  roomId: id('Choose the room.'),
  name: text(80, 'Enter the scanner name.'),
  aeTitle: aeTitleSchema,
});
export type ScannerFields = z.infer<typeof scannerFieldsSchema>;
export type ScannerFormValues = z.input<typeof scannerFieldsSchema>;

const isoDay = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Enter a date as YYYY-MM-DD.').refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)), 'Not a real date.');
const mhz = (label: string) =>
  z.coerce.number({ message: `Enter the ${label} frequency in MHz.` }).min(0.5, 'Use at least 0.5 MHz.').max(50, 'Use at most 50 MHz.');

export const probeFieldsSchema = z
  .object({
    kind: z.enum(PROBE_KIND_CODES, { message: 'Choose a probe kind.' }),
    modelLabel: text(80, 'Enter the model label the clinic uses.'),
    serialNumber: text(60, 'Enter the serial number.'),
    minFrequencyMhz: mhz('lowest'),
    maxFrequencyMhz: mhz('highest'),
    endocavitary: z.boolean().default(false),
    /** The scanner it is plugged into; null while it is on the shelf. */
    scannerId: z.preprocess((v) => (v === '' ? null : v), id('Choose a scanner.').nullable()).default(null),
    inServiceFrom: isoDay,
    inServiceTo: z.preprocess((v) => (v === '' ? null : v), isoDay.nullable()).default(null),
  })
  .refine((v) => v.minFrequencyMhz < v.maxFrequencyMhz, {
    path: ['maxFrequencyMhz'],
    message: 'The highest frequency must be above the lowest.',
    ...whenValid('minFrequencyMhz', 'maxFrequencyMhz'),
  })
  .refine((v) => v.inServiceTo === null || v.inServiceFrom <= v.inServiceTo, {
    path: ['inServiceTo'],
    message: 'The end of service cannot be before its start.',
    ...whenValid('inServiceFrom', 'inServiceTo'),
  });
export type ProbeFields = z.infer<typeof probeFieldsSchema>;
export type ProbeFormValues = z.input<typeof probeFieldsSchema>;

const version = z.number({ message: 'Send the version you opened.' }).int().min(0);

/** An edit: the whole entity plus the version it was opened with. */
export const withVersion = <S extends z.ZodType<Record<string, unknown>>>(schema: S) =>
  z.intersection(schema, z.object({ version }));

export const updateExamTypeSchema = withVersion(examTypeFieldsSchema);
export const updateRoomSchema = withVersion(roomFieldsSchema);
export const updateScannerSchema = withVersion(scannerFieldsSchema);
export const updateProbeSchema = withVersion(probeFieldsSchema);
export type Versioned<T> = T & { version: number };

/**
 * Deactivate (`active: false`) or reactivate. Nothing in the catalog is ever deleted: a retired
 * exam type, room or scanner stays for the exams that name it. For a probe, deactivating ends
 * its service today and reactivating clears the end date.
 */
export const activeChangeSchema = z.object({ version, active: z.boolean({ message: 'Send active: true or false.' }) });
export type ActiveChange = z.infer<typeof activeChangeSchema>;

export const catalogIdParamsSchema = z.object({ id: z.coerce.number().int().positive('Not a valid id.') });

export interface ExamTypeRow extends ExamTypeFields {
  id: number;
  code: string;
  currency: string;
  active: boolean;
  version: number;
  /** Exams booked with this type, ever: its template can no longer change. */
  examCount: number;
}

export interface RoomRow extends RoomFields {
  id: number;
  active: boolean;
  version: number;
  /** Names of the active scanners in the room. */
  scanners: string[];
}

export interface ScannerRow extends ScannerFields {
  id: number;
  roomName: string;
  active: boolean;
  version: number;
  /** Booked or arrived exams from now on that name this scanner. */
  upcomingExams: number;
}

export interface ProbeRow extends ProbeFields {
  id: number;
  scannerName: string | null;
  /** In service today, in the clinic's time zone. */
  inService: boolean;
  version: number;
}

/** What a (de)activation answers: the row, and for a scanner how many booked exams still name it. */
export interface ActiveChangeResult<Row> {
  row: Row;
  upcomingExams?: number;
}
