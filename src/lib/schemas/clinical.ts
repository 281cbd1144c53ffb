import { z } from 'zod';

// Shape only: the clinical engine itself checks each value against the template's plausible
// bounds and answers with field errors keyed the same way ("measurements.lviddCm").
const isoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a calendar date, YYYY-MM-DD.');
const entry = z.union([z.number().finite(), z.string().max(40)]);
export const measurementsSchema = z
  .record(z.string().min(1).max(60), entry)
  .refine((m) => Object.keys(m).length <= 200, 'Too many measurements.');

/** One thyroid nodule as entered (the engine checks the values). */
export const noduleSchema = z
  .object({
    id: z.string().max(40).optional(),
    lobe: z.string().max(20),
    zone: z.string().max(20).nullish(),
    lengthMm: z.number(),
    widthMm: z.number(),
    depthMm: z.number(),
    composition: z.string().max(40),
    echogenicity: z.string().max(40),
    shape: z.string().max(40),
    margin: z.string().max(40),
    foci: z.array(z.string().max(40)).max(5),
  })
  .strict();

/** Body of POST /api/clinical/evaluate. Reference rows come from the server, never the caller. */
export const evaluateRequestSchema = z
  .object({
    templateId: z.enum(['thyroid', 'abdomen', 'echo'], { message: 'Choose thyroid, abdomen or echo.' }),
    measurements: measurementsSchema,
    nodules: z.array(noduleSchema).max(10, 'At most 10 nodules.').optional(),
    patient: z
      .object({
        sex: z.enum(['male', 'female', 'other', 'unknown']).nullish(),
        birthDate: isoDate,
        examDate: isoDate,
        heightCm: z.number().nullish(),
        weightKg: z.number().nullish(),
      })
      .strict(),
    prior: z
      .object({ examDate: isoDate, measurements: measurementsSchema.optional(), nodules: z.array(noduleSchema).max(10).optional() })
      .strict()
      .nullish(),
    options: z
      .object({
        bsaMethod: z.enum(['mosteller', 'dubois']).optional(),
        ellipsoidCoefficient: z.number().optional(),
        aaaScheme: z.enum(['svs-2018', 'acr-2013', 'nhs-aaa', 'esc-2024', 'esvs-2019']).optional(),
        cbdAllowance: z.enum(['per-decade-over-60', 'none']).optional(),
        laAreaLengthConstant: z.number().optional(),
      })
      .strict()
      .optional(),
  })
  .strict();
export type EvaluateRequest = z.infer<typeof evaluateRequestSchema>;
