import { z } from 'zod';
import { isCalendarDate, MAX_PERIOD_DAYS, periodDays } from '../dashboard/period';
import { TABLE_NAMES } from '../dashboard/tables';

const clinicDay = z.string().trim().refine(isCalendarDate, 'Use a date written YYYY-MM-DD.');

/** The period the dashboard answers for: clinic days `from` to `to`, both included, at most 366. */
export const dashboardPeriodSchema = z
  .object({ from: clinicDay, to: clinicDay })
  .superRefine((v, ctx) => {
    if (!isCalendarDate(v.from) || !isCalendarDate(v.to)) return;
    if (v.to < v.from) ctx.addIssue({ code: 'custom', path: ['to'], message: 'The last day comes before the first.' });
    else if (periodDays(v.from, v.to) > MAX_PERIOD_DAYS) ctx.addIssue({ code: 'custom', path: ['to'], message: `Choose at most ${MAX_PERIOD_DAYS} days.` });
  });
export type DashboardPeriod = z.infer<typeof dashboardPeriodSchema>;

/** One table of the dashboard as CSV, for a period. */
export const dashboardExportSchema = z
  .object({ table: z.enum(TABLE_NAMES, { message: `Choose one of: ${TABLE_NAMES.join(', ')}.` }), from: clinicDay, to: clinicDay })
  .superRefine((v, ctx) => {
    const period = dashboardPeriodSchema.safeParse({ from: v.from, to: v.to });
    if (!period.success) for (const issue of period.error.issues) ctx.addIssue({ code: 'custom', path: issue.path, message: issue.message });
  });
export type DashboardExport = z.infer<typeof dashboardExportSchema>;
