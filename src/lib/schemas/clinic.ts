import { z } from 'zod';

/** The clinic's identity and locale, stored in settings under 'clinic'. */
export const clinicProfileSchema = z.object({
  name: z.string().min(1).max(120),
  addressLines: z.array(z.string().max(120)).max(4),
  phone: z.string().max(40),
  email: z.string().email().max(254),
  timeZone: z.string().refine((tz) => {
    try {
      new Intl.DateTimeFormat('en', { timeZone: tz });
      return true;
    } catch {
      return false;
    }
  }, 'must be an IANA time zone such as America/Chicago'),
  currency: z.string().length(3),
});
export type ClinicProfile = z.infer<typeof clinicProfileSchema>;
