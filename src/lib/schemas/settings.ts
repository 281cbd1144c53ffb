import { z } from 'zod';
import { URGENT_RULES, type UrgentRuleId } from '../clinical/urgent';
import type { ClinicProfile } from './clinic';

const clock = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Use 24-hour HH:MM.');
const isoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Use YYYY-MM-DD.');

/** Opening hours per weekday (index 0 = Sunday) and dates the clinic is closed. */
export const clinicHoursSchema = z.object({
  weekly: z
    .array(z.array(z.object({ open: clock, close: clock }).refine((s) => s.open < s.close, 'Opening must come before closing.')).max(3))
    .length(7),
  closedDates: z.array(isoDate).max(366),
});
export type ClinicHours = z.infer<typeof clinicHoursSchema>;

const weekday = [{ open: '08:00', close: '17:00' }];
export const DEFAULT_CLINIC_HOURS: ClinicHours = {
  weekly: [[], weekday, weekday, weekday, weekday, weekday, [{ open: '08:00', close: '12:00' }]],
  closedDates: [],
};

/**
 * Cancellation refunds: cancelled at least `fullRefundHoursAhead` hours before the start, the
 * patient gets everything back; later than that, the deposit is kept (issue 4's clinic policy).
 */
export const paymentPolicySchema = z.object({
  fullRefundHoursAhead: z.number().int().min(0).max(24 * 30),
});
export type PaymentPolicy = z.infer<typeof paymentPolicySchema>;
export const DEFAULT_PAYMENT_POLICY: PaymentPolicy = { fullRefundHoursAhead: 24 };

/** Delivery of final reports to referring clinicians ('reports.delivery'). */
export const reportDeliverySchema = z.object({
  /** How long an e-mailed report link works, in days. */
  linkDays: z.number().int().min(1).max(365),
  /** Whether the PDF goes with the e-mail as an attachment (off: the link only). */
  attachPdf: z.boolean(),
});
export type ReportDelivery = z.infer<typeof reportDeliverySchema>;
export const DEFAULT_REPORT_DELIVERY: ReportDelivery = { linkDays: 30, attachPdf: false };

// ---------------------------------------------------------------------------------------------
// Urgent-finding prompts per rule, and the clinic settings form (issue 8).

/** Every urgent-finding rule, in the order urgent.ts lists them. */
export const URGENT_RULE_IDS = Object.keys(URGENT_RULES) as [UrgentRuleId, ...UrgentRuleId[]];

/**
 * Urgent-finding prompts on or off per rule ('reports.urgentRules'), e.g. `{ "lvef-severe": false }`.
 * A rule missing from the map is on, so a rule added later prompts until the clinic switches it
 * off. Ids no longer known are tolerated rather than refused: a refused row would read as the
 * default, and silently switch every rule back on.
 */
export const urgentRulesSchema = z.record(z.string(), z.boolean());
export type UrgentRules = z.infer<typeof urgentRulesSchema>;
export const DEFAULT_URGENT_RULES: Record<UrgentRuleId, boolean> = Object.fromEntries(URGENT_RULE_IDS.map((id) => [id, true])) as Record<UrgentRuleId, boolean>;

/** The rules a stored map switches off, e.g. `switchedOffRules({ 'lvef-severe': false })` → `['lvef-severe']`. */
export function switchedOffRules(rules: UrgentRules): UrgentRuleId[] {
  return URGENT_RULE_IDS.filter((id) => rules[id] === false);
}

/**
 * Whether a name is an IANA time zone this runtime knows, e.g. 'America/Chicago' or 'UTC';
 * offsets such as '+01:00' are refused (they ignore daylight saving).
 */
export function isIanaTimeZone(tz: string): boolean {
  if (!/^[A-Za-z][A-Za-z0-9_+-]*(\/[A-Za-z0-9_+-]+)*$/.test(tz)) return false;
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: tz });
    return true;
  } catch {
    return false;
  }
}

/** Whether YYYY-MM-DD names a day of the calendar (not 2027-02-30). */
function isCalendarDate(s: string): boolean {
  const [y, m, d] = s.split('-').map(Number) as [number, number, number];
  const date = new Date(Date.UTC(y, m - 1, d));
  return date.getUTCFullYear() === y && date.getUTCMonth() === m - 1 && date.getUTCDate() === d;
}

/** The version of a setting the form loaded (GET /api/admin/settings); a save against another answers 409. */
const settingVersion = z.string().min(1, 'Reload the page and try again.').max(64);

/** PUT /api/admin/settings/clinic: the profile as the manager edits it (the currency is not edited here). */
export const clinicSettingsSchema = z
  .object({
    version: settingVersion,
    name: z.string().trim().min(1, 'Enter the clinic’s name.').max(120, 'At most 120 characters.'),
    /** Up to four lines; blank lines are dropped when saved. */
    addressLines: z.array(z.string().trim().max(120, 'At most 120 characters.')).max(4, 'At most four address lines.'),
    phone: z.string().trim().max(40, 'At most 40 characters.'),
    email: z.string().trim().email('Enter an e-mail address such as front@clinic.example.').max(254),
    timeZone: z.string().trim().refine(isIanaTimeZone, 'Choose a time zone from the list, such as America/Chicago.'),
  })
  .strict();
export type ClinicSettingsInput = z.infer<typeof clinicSettingsSchema>;

const session = z
  .object({ open: clock, close: clock })
  .refine((s) => s.open < s.close, { message: 'Closing must come after opening.', path: ['close'] });

/** PUT /api/admin/settings/hours: up to three sessions per weekday (index 0 = Sunday) and closed dates. */
export const hoursSettingsSchema = z
  .object({
    version: settingVersion,
    weekly: z
      .array(
        z
          .array(session)
          .max(3, 'At most three sessions a day.')
          .superRefine((sessions, ctx) => {
            const order = sessions.map((s, i) => ({ ...s, i })).sort((a, b) => (a.open < b.open ? -1 : 1));
            for (let k = 1; k < order.length; k++) {
              if (order[k]!.open < order[k - 1]!.close) ctx.addIssue({ code: 'custom', message: 'Overlaps another session of the day.', path: [order[k]!.i, 'open'] });
            }
          }),
      )
      .length(7, 'Give the hours of all seven weekdays.'),
    closedDates: z
      .array(isoDate.refine(isCalendarDate, 'There is no such date.'))
      .max(366, 'At most 366 closed dates.')
      .superRefine((dates, ctx) => {
        dates.forEach((d, i) => {
          if (dates.indexOf(d) !== i) ctx.addIssue({ code: 'custom', message: 'This date is already in the list.', path: [i] });
        });
      }),
  })
  .strict();
export type HoursSettingsInput = z.infer<typeof hoursSettingsSchema>;

const wholeNumber = (what: string) => z.number({ error: `Enter ${what} as a whole number.` }).int(`Enter ${what} as a whole number.`);

/** PUT /api/admin/settings/cancellations: the full-refund window. */
export const cancellationSettingsSchema = z
  .object({
    version: settingVersion,
    fullRefundHoursAhead: wholeNumber('the hours').min(0, 'Zero or more hours.').max(24 * 30, 'At most 720 hours (30 days).'),
  })
  .strict();
export type CancellationSettingsInput = z.infer<typeof cancellationSettingsSchema>;

/** PUT /api/admin/settings/delivery: report links to referrers and the PDF attachment. */
export const deliverySettingsSchema = z
  .object({
    version: settingVersion,
    linkDays: wholeNumber('the days').min(1, 'At least one day.').max(365, 'At most 365 days.'),
    attachPdf: z.boolean(),
  })
  .strict();
export type DeliverySettingsInput = z.infer<typeof deliverySettingsSchema>;

/** PUT /api/admin/settings/urgent-rules: every rule on or off (all of them, no unknown ids). */
export const urgentRulesSettingsSchema = z
  .object({
    version: settingVersion,
    rules: z.record(z.enum(URGENT_RULE_IDS), z.boolean()),
  })
  .strict();
export type UrgentRulesSettingsInput = z.infer<typeof urgentRulesSettingsSchema>;

/** One setting as the form shows it: its value, the version to send back, when it was last saved. */
export interface SettingState<T> {
  value: T;
  version: string;
  /** ISO instant of the last save; null while the built-in default applies. */
  updatedAt: string | null;
}

/** GET /api/admin/settings: every group of the clinic settings form. */
export interface ClinicSettingsDto {
  clinic: SettingState<ClinicProfile>;
  hours: SettingState<ClinicHours>;
  cancellations: SettingState<PaymentPolicy>;
  delivery: SettingState<ReportDelivery>;
  urgentRules: SettingState<Record<UrgentRuleId, boolean>>;
}
export type SettingsGroup = keyof ClinicSettingsDto;

/** The settings key each group of the form saves. */
export const SETTINGS_GROUP_KEYS: Readonly<Record<SettingsGroup, string>> = {
  clinic: 'clinic',
  hours: 'clinic.hours',
  cancellations: 'payments.policy',
  delivery: 'reports.delivery',
  urgentRules: 'reports.urgentRules',
};

/** Booked exams on a date the save has just closed: they stay booked, the form says so. */
export interface BookedOnClosedDate {
  date: string;
  exams: number;
}
