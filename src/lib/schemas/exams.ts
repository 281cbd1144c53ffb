import { z } from 'zod';
import { EXAM_STATUSES, PAYERS, PRIORITIES } from '../exam-status';

const id = z.coerce.number().int().positive();
const isoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a calendar date, YYYY-MM-DD.');
/** An instant with its offset, e.g. "2026-12-03T15:00:00.000Z". */
const instant = z.iso.datetime({ offset: true, message: 'Choose a start time.' });

export const bookExamSchema = z.object({
  patientId: id,
  examTypeId: id,
  referrerId: id.nullable(),
  indication: z.string().trim().min(3, 'Write the reason for the exam (at least 3 characters).').max(1000),
  priority: z.enum(PRIORITIES),
  payer: z.enum(PAYERS),
  roomId: id,
  scannerId: id,
  sonographerId: id,
  start: instant,
});
export type BookExamInput = z.infer<typeof bookExamSchema>;

export const rescheduleSchema = z.object({
  version: z.number().int().min(0),
  start: instant,
  roomId: id.optional(),
  scannerId: id.optional(),
  sonographerId: id.optional(),
});
export type RescheduleInput = z.infer<typeof rescheduleSchema>;

export const cancelSchema = z.object({
  version: z.number().int().min(0),
  reason: z.string().trim().min(3, 'Give the reason for cancelling.').max(500),
});
export type CancelInput = z.infer<typeof cancelSchema>;

/** Moves the front desk makes from the list: check in, or mark a patient who did not come. */
export const statusMoveSchema = z.object({
  version: z.number().int().min(0),
  to: z.enum(['arrived', 'noshow']),
});
export type StatusMoveInput = z.infer<typeof statusMoveSchema>;

export const WORKLIST_SORTS = ['time', 'patient', 'examType', 'room', 'status', 'payment'] as const;
export const worklistQuerySchema = z.object({
  day: isoDate,
  roomId: id.optional(),
  sonographerId: id.optional(),
  status: z.enum(EXAM_STATUSES).optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
  sort: z.enum(WORKLIST_SORTS).default('time'),
  dir: z.enum(['asc', 'desc']).default('asc'),
});
export type WorklistQuery = z.infer<typeof worklistQuerySchema>;

export const slotsQuerySchema = z.object({
  examTypeId: id,
  roomId: id,
  scannerId: id,
  sonographerId: id,
  from: isoDate.optional(),
  /** When rescheduling, the exam's own time is free. */
  excludeExamId: id.optional(),
});
export type SlotsQuery = z.infer<typeof slotsQuerySchema>;

/** Test payment methods of the provider, offered only against the local payments fake. */
export const TEST_PAYMENT_METHODS = [
  { id: 'pm_card_visa', label: 'Test card — payment succeeds' },
  { id: 'pm_card_chargeDeclined', label: 'Test card — declined' },
  { id: 'pm_card_chargeDeclinedInsufficientFunds', label: 'Test card — insufficient funds' },
] as const;

export const takePaymentSchema = z.object({
  kind: z.enum(['deposit', 'balance']),
  /** A provider payment-method id: a test method in test mode, or one made by the provider's own card element. */
  paymentMethod: z.string().regex(/^pm_[A-Za-z0-9_]{3,80}$/, 'Choose a payment method.').optional(),
});
export type TakePaymentInput = z.infer<typeof takePaymentSchema>;

/** One row of the worklist, as the list shows it. */
export interface WorklistRow {
  id: number;
  accessionNumber: string;
  start: string;
  time: string;
  durationMinutes: number;
  patientId: number;
  patientName: string;
  mrn: string;
  examType: string;
  room: string;
  roomId: number;
  sonographer: string;
  status: (typeof EXAM_STATUSES)[number];
  priority: (typeof PRIORITIES)[number];
  paymentState: import('../exam-status').PaymentState;
  version: number;
}
