import type { Transaction } from 'sequelize';
import { Exam, Payment } from '../../db/models';
import type { PaymentState } from '../../lib/exam-status';

export interface LedgerTotals {
  depositPaidCents: number;
  balancePaidCents: number;
  refundedCents: number;
  /** Refunds decided but not yet confirmed by the provider. */
  refundPendingCents: number;
}

/** Sums of the succeeded movements of an exam. */
export async function ledgerTotals(examId: number, transaction?: Transaction): Promise<LedgerTotals> {
  const rows = await Payment.findAll({ where: { examId }, transaction });
  const sum = (kind: string, status = 'succeeded') => rows.filter((r) => r.kind === kind && r.status === status).reduce((a, r) => a + r.amountCents, 0);
  return { depositPaidCents: sum('deposit'), balancePaidCents: sum('balance'), refundedCents: sum('refund'), refundPendingCents: sum('refund', 'pending') };
}

/** What the ledger adds up to, in the words the worklist shows. */
export function paymentStateOf(exam: Pick<Exam, 'payer' | 'status' | 'priceCents' | 'depositCents'>, t: LedgerTotals): PaymentState {
  if (exam.payer !== 'self-pay') return 'none';
  const paid = t.depositPaidCents + t.balancePaidCents;
  if (exam.status === 'cancelled' || exam.status === 'noshow') {
    if (paid === 0) return 'none';
    if (t.refundPendingCents > 0) return 'refund-due';
    return t.refundedCents >= paid ? 'refunded' : 'deposit-kept';
  }
  if (paid - t.refundedCents >= exam.priceCents) return 'paid';
  if (exam.depositCents > 0 && t.depositPaidCents >= exam.depositCents) return 'deposit-paid';
  return exam.depositCents > 0 ? 'deposit-due' : 'none';
}

/** Brings the exam's payment state in line with its ledger (inside the caller's transaction). */
export async function recomputePaymentState(exam: Exam, transaction: Transaction): Promise<PaymentState> {
  const state = paymentStateOf(exam, await ledgerTotals(exam.id, transaction));
  if (state !== exam.paymentState) await exam.update({ paymentState: state }, { transaction });
  return state;
}
