import type { Transaction } from 'sequelize';
import { Setting } from '../../db/models';
import { clinicProfileSchema, type ClinicProfile } from '../../lib/schemas/clinic';
import {
  clinicHoursSchema,
  DEFAULT_CLINIC_HOURS,
  DEFAULT_PAYMENT_POLICY,
  DEFAULT_REPORT_DELIVERY,
  paymentPolicySchema,
  reportDeliverySchema,
  switchedOffRules,
  urgentRulesSchema,
  type ClinicHours,
  type PaymentPolicy,
  type ReportDelivery,
} from '../../lib/schemas/settings';
import type { UrgentRuleId } from '../../lib/clinical/urgent';

/** Used until the manager saves a profile; the demo seed writes a full one. */
export const DEFAULT_CLINIC_PROFILE: ClinicProfile = {
  name: 'Crestline clinic',
  addressLines: [],
  phone: '',
  email: 'clinic@example.invalid',
  timeZone: 'UTC',
  currency: 'USD',
};

const CACHE_MS = 30_000;
const cache = new Map<string, { at: number; value: unknown }>();

/** Drops cached settings (after the manager changes one). */
export function forgetSettingsCache(): void {
  cache.clear();
}

/**
 * Reads one setting, validated, with a fallback, cached for half a minute. Inside a use-case
 * pass its transaction, so the read uses the transaction's connection and never waits for a
 * second one from the pool.
 */
async function readSetting<T>(key: string, schema: { safeParse(v: unknown): { success: boolean; data?: T } }, fallback: T, transaction?: Transaction): Promise<T> {
  const hit = cache.get(key);
  if (hit && Date.now() - hit.at < CACHE_MS) return hit.value as T;
  const row = await Setting.findByPk(key, { transaction });
  const parsed = schema.safeParse(row?.value);
  const value = parsed.success ? (parsed.data as T) : fallback;
  cache.set(key, { at: Date.now(), value });
  return value;
}

/** The clinic profile (name, address, time zone). */
export async function clinicProfile(transaction?: Transaction): Promise<ClinicProfile> {
  try {
    return await readSetting('clinic', clinicProfileSchema, DEFAULT_CLINIC_PROFILE, transaction);
  } catch (error) {
    // The sign-in page must still render when the database is away (not cached).
    if (transaction) throw error;
    return DEFAULT_CLINIC_PROFILE;
  }
}

/** Opening hours per weekday and closed dates ('clinic.hours'). */
export function clinicHours(transaction?: Transaction): Promise<ClinicHours> {
  return readSetting('clinic.hours', clinicHoursSchema, DEFAULT_CLINIC_HOURS, transaction);
}

/** The cancellation refund policy ('payments.policy'). */
export function paymentPolicy(transaction?: Transaction): Promise<PaymentPolicy> {
  return readSetting('payments.policy', paymentPolicySchema, DEFAULT_PAYMENT_POLICY, transaction);
}

/** Report delivery to referrers: link lifetime and whether the PDF is attached ('reports.delivery'). */
export function reportDelivery(transaction?: Transaction): Promise<ReportDelivery> {
  return readSetting('reports.delivery', reportDeliverySchema, DEFAULT_REPORT_DELIVERY, transaction);
}

/** The urgent-finding rules the clinic has switched off ('reports.urgentRules'; every rule is on until then). */
export async function disabledUrgentRules(transaction?: Transaction): Promise<UrgentRuleId[]> {
  return switchedOffRules(await readSetting('reports.urgentRules', urgentRulesSchema, {}, transaction));
}
