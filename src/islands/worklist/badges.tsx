import { EXAM_STATUS_LABELS, PAYMENT_STATE_LABELS, type ExamStatus, type PaymentState } from '../../lib/exam-status';

const STATUS_TONE: Record<ExamStatus, string> = {
  booked: 'bg-ink-50 text-ink-700 ring-ink-200',
  arrived: 'bg-dune-50 text-dune-700 ring-dune-300',
  'in-progress': 'bg-crest-50 text-crest-800 ring-crest-300',
  completed: 'bg-crest-600 text-white ring-crest-700',
  cancelled: 'bg-white text-ink-400 ring-ink-200 line-through',
  noshow: 'bg-high-50 text-high-800 ring-high-200',
};

/** The exam status pill (same colours as the server-rendered StatusBadge). */
export function StatusPill({ status }: { status: ExamStatus }) {
  return <span className={`inline-flex items-center rounded-full px-2 py-0.5 text-xs font-semibold ring-1 ring-inset ${STATUS_TONE[status]}`}>{EXAM_STATUS_LABELS[status]}</span>;
}

const PAY_TONE: Record<PaymentState, string> = {
  none: 'text-ink-400',
  'deposit-due': 'text-high-800 font-semibold',
  'deposit-paid': 'text-crest-700',
  paid: 'text-crest-800 font-semibold',
  'refund-due': 'text-dune-700',
  refunded: 'text-ink-500',
  'deposit-kept': 'text-ink-600',
};

export function PaymentLabel({ state }: { state: PaymentState }) {
  return <span className={`text-xs ${PAY_TONE[state]}`}>{PAYMENT_STATE_LABELS[state]}</span>;
}
