import type { ProbeKind } from './clinical/types';

/**
 * Exam (appointment) statuses after FHIR's Appointment vocabulary, and the moves allowed
 * between them (DESIGN.md, exam lifecycle).
 */
export const EXAM_STATUSES = [
  'booked',
  'arrived',
  'in-progress',
  'completed',
  'cancelled',
  'noshow',
] as const;
export type ExamStatus = (typeof EXAM_STATUSES)[number];

export const EXAM_STATUS_LABELS: Record<ExamStatus, string> = {
  booked: 'Booked',
  arrived: 'Arrived',
  'in-progress': 'Scanning',
  completed: 'Scanned',
  cancelled: 'Cancelled',
  noshow: 'Did not attend',
};

const MOVES: Record<ExamStatus, readonly ExamStatus[]> = {
  booked: ['arrived', 'cancelled', 'noshow'],
  arrived: ['in-progress', 'cancelled', 'noshow'],
  'in-progress': ['completed', 'arrived'],
  completed: [],
  cancelled: [],
  noshow: [],
};

/** Whether an exam may move from `from` to `to`, e.g. canMoveExam('booked', 'arrived') → true. */
export function canMoveExam(from: ExamStatus, to: ExamStatus): boolean {
  return MOVES[from].includes(to);
}

export const PRIORITIES = ['routine', 'urgent'] as const;
export type Priority = (typeof PRIORITIES)[number];

/** Probe kinds; the same names the clinical engine uses (its PROBE_KINDS holds their bands). */
export const PROBE_KIND_CODES = ['linear', 'curvilinear', 'phased-array'] as const satisfies readonly ProbeKind[];
export type { ProbeKind };

export const SEXES = ['female', 'male', 'other', 'unknown'] as const;
export type Sex = (typeof SEXES)[number];

/** Who pays: self-pay patients pay a deposit and the balance here; insured exams are billed elsewhere. */
export const PAYERS = ['self-pay', 'insured'] as const;
export type Payer = (typeof PAYERS)[number];

/** What the payment ledger of an exam adds up to (kept on the exam row for the worklist). */
export const PAYMENT_STATES = ['none', 'deposit-due', 'deposit-paid', 'paid', 'refund-due', 'refunded', 'deposit-kept'] as const;
export type PaymentState = (typeof PAYMENT_STATES)[number];

export const PAYMENT_STATE_LABELS: Record<PaymentState, string> = {
  none: 'Billed elsewhere',
  'deposit-due': 'Deposit due',
  'deposit-paid': 'Deposit paid',
  paid: 'Paid in full',
  'refund-due': 'Refund on its way',
  refunded: 'Refunded',
  'deposit-kept': 'Deposit kept',
};
