import { z } from 'zod';

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
