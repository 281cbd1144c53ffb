import { Setting } from '../../db/models';
import { clinicProfileSchema, type ClinicProfile } from '../../lib/schemas/clinic';

// Used until the manager saves a profile; the demo seed writes a full one.
const FALLBACK: ClinicProfile = {
  name: 'Crestline clinic',
  addressLines: [],
  phone: '',
  email: 'clinic@example.invalid',
  timeZone: 'UTC',
  currency: 'USD',
};

let cache: { at: number; value: ClinicProfile } | undefined;
const CACHE_MS = 30_000;

/** The clinic profile (name, address, time zone), cached for half a minute. */
export async function clinicProfile(): Promise<ClinicProfile> {
  if (cache && Date.now() - cache.at < CACHE_MS) return cache.value;
  let row: Setting | null;
  try {
    row = await Setting.findByPk('clinic');
  } catch {
    // The sign-in page must still render when the database is away; do not cache this.
    return FALLBACK;
  }
  const parsed = clinicProfileSchema.safeParse(row?.value);
  const value = parsed.success ? parsed.data : FALLBACK;
  cache = { at: Date.now(), value };
  return value;
}
