import { z } from 'zod';

const optionalPhone = z
  .string()
  .trim()
  .max(40, 'Use at most 40 characters.')
  .refine((v) => v === '' || /^\+?[0-9 ().-]+$/.test(v), 'Use digits, spaces and + ( ) - only.')
  .refine((v) => v === '' || v.replace(/\D/g, '').length >= 5, 'A phone number has at least 5 digits.')
  .nullish()
  .transform((v) => v || null);

/** A referring clinician's directory entry; the same schema drives form and endpoint. */
export const referrerFieldsSchema = z.object({
  name: z.string().trim().min(2, 'Enter the name.').max(160, 'Use at most 160 characters.'),
  practice: z.string().trim().min(2, 'Enter the practice.').max(160, 'Use at most 160 characters.'),
  email: z.string().trim().toLowerCase().max(254, 'Use at most 254 characters.').pipe(z.email('Enter a valid e-mail address.')),
  phone: optionalPhone,
});
export type ReferrerFields = z.infer<typeof referrerFieldsSchema>;
export type ReferrerFormValues = z.input<typeof referrerFieldsSchema>;
export const REFERRER_FIELDS = Object.keys(referrerFieldsSchema.shape) as Array<keyof ReferrerFields>;

export const createReferrerSchema = referrerFieldsSchema;
export type CreateReferrerInput = z.infer<typeof createReferrerSchema>;

/** A change to an entry, or its (de)activation; `version` is the one the person saw. */
export const updateReferrerSchema = referrerFieldsSchema
  .partial()
  .extend({ version: z.number().int().min(0), active: z.boolean().optional() })
  .refine((v) => Object.keys(v).some((k) => k !== 'version'), { message: 'Nothing to change.' });
export type UpdateReferrerInput = z.infer<typeof updateReferrerSchema>;

/**
 * The directory list, also the booking form's referrer picker (`?active=true&q=…`).
 * `active` is "true" or "false"; leave it out for both.
 */
export const referrerListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
  sort: z.enum(['name', 'practice', 'email']).default('name'),
  dir: z.enum(['asc', 'desc']).default('asc'),
  q: z.string().trim().max(100, 'Use at most 100 characters.').optional(),
  active: z
    .enum(['true', 'false'], { message: 'Use true or false.' })
    .optional()
    .transform((v) => (v === undefined ? undefined : v === 'true')),
});
export type ReferrerListQuery = z.infer<typeof referrerListQuerySchema>;
/** The list's query string as the browser sends it. */
export type ReferrerListParams = Omit<ReferrerListQuery, 'active'> & { active?: 'true' | 'false' };

export const referrerIdParamsSchema = z.object({ id: z.coerce.number().int().positive('Not a valid id.') });

/** A directory entry as the list, the picker and the edit form use it. */
export interface ReferrerRow {
  id: number;
  name: string;
  practice: string;
  email: string;
  phone: string | null;
  active: boolean;
  version: number;
}
