import { QueryClientProvider } from '@tanstack/react-query';
import { useState } from 'react';
import { api, ApiError } from '../lib/api-client';
import type { ExamStatus } from '../lib/exam-status';
import { queryClient } from '../lib/query-client';
import { formatInstant } from '../lib/time';
import { SlotPicker } from './booking/SlotPicker';
import { CancelExam } from './exams/CancelExam';
import { TakePayment } from './payments/TakePayment';

interface Props {
  exam: {
    id: number;
    version: number;
    status: ExamStatus;
    payer: 'self-pay' | 'insured';
    currency: string;
    examTypeId: number;
    roomId: number;
    scannerId: number;
    sonographerId: number;
  };
  depositDueCents: number;
  balanceDueCents: number;
  pendingRefunds: boolean;
  cancelPreview: { refundCents: number; keptCents: number; reason: string; currency: string } | null;
  timeZone: string;
  paymentsMode: 'test' | 'live' | 'off';
  publishableKey?: string;
}

/** The front desk's actions on one exam; each reloads the page to show the new state. */
function Actions(p: Props) {
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [moving, setMoving] = useState(false);
  const [newStart, setNewStart] = useState<string | null>(null);
  const { exam } = p;
  const done = (message: string) => {
    sessionStorage.setItem('crestline-notice', message);
    window.location.reload();
  };
  const run = async (path: string, body: unknown, message: string) => {
    setBusy(true);
    setProblem(null);
    try {
      await api(path, { method: 'POST', body });
      done(message);
    } catch (e) {
      setProblem(e instanceof ApiError ? e.message : 'That did not work; nothing was changed.');
      setBusy(false);
    }
  };
  const canMove = exam.status === 'booked';
  const open = exam.status === 'booked' || exam.status === 'arrived';

  return (
    <div className="space-y-4">
      {problem && <p role="alert" className="rounded-md bg-high-50 px-3 py-2 text-sm text-high-800">{problem}</p>}
      <div className="flex flex-wrap gap-2">
        {exam.status === 'booked' && <button type="button" className="btn-primary" disabled={busy} onClick={() => run(`/api/exams/${exam.id}/status`, { version: exam.version, to: 'arrived' }, 'Checked in.')}>Check in</button>}
        {open && <button type="button" className="btn-quiet" disabled={busy} onClick={() => run(`/api/exams/${exam.id}/status`, { version: exam.version, to: 'noshow' }, 'Marked as did not attend.')}>Did not attend</button>}
        {canMove && <button type="button" className="btn-quiet" aria-expanded={moving} onClick={() => setMoving((v) => !v)}>Reschedule…</button>}
        {p.pendingRefunds && <button type="button" className="btn-quiet" disabled={busy} onClick={() => run(`/api/exams/${exam.id}/refunds`, undefined, 'Refunds sent again.')}>Send waiting refunds now</button>}
        {open && <CancelExam examId={exam.id} version={exam.version} preview={p.cancelPreview} onDone={done} />}
      </div>
      {moving && (
        <div className="space-y-3 rounded-md border border-ink-100 p-4">
          <SlotPicker examTypeId={exam.examTypeId} roomId={exam.roomId} scannerId={exam.scannerId} sonographerId={exam.sonographerId} excludeExamId={exam.id} selected={newStart} onPick={setNewStart} />
          <button type="button" className="btn-primary" disabled={!newStart || busy} onClick={() => run(`/api/exams/${exam.id}/reschedule`, { version: exam.version, start: newStart }, `Moved to ${formatInstant(new Date(newStart!), p.timeZone)}. The patient is told by e-mail.`)}>
            {newStart ? `Move to ${formatInstant(new Date(newStart), p.timeZone)}` : 'Pick a new time'}
          </button>
        </div>
      )}
      {exam.payer === 'self-pay' && p.depositDueCents > 0 && open && (
        <div className="rounded-md border border-dune-300 bg-dune-50 p-4">
          <h3 className="mb-2 font-semibold">Deposit due</h3>
          <TakePayment examId={exam.id} kind="deposit" amountCents={p.depositDueCents} currency={exam.currency} mode={p.paymentsMode} publishableKey={p.publishableKey} onDone={(a) => done(a.message)} />
        </div>
      )}
      {exam.payer === 'self-pay' && p.balanceDueCents > 0 && ['arrived', 'in-progress', 'completed'].includes(exam.status) && (
        <div className="rounded-md border border-ink-200 p-4">
          <h3 className="mb-2 font-semibold">Balance at check-out</h3>
          <TakePayment examId={exam.id} kind="balance" amountCents={p.balanceDueCents} currency={exam.currency} mode={p.paymentsMode} publishableKey={p.publishableKey} onDone={(a) => done(a.message)} />
        </div>
      )}
    </div>
  );
}

export default function ExamActions(props: Props) {
  return (
    <QueryClientProvider client={queryClient}>
      <Actions {...props} />
    </QueryClientProvider>
  );
}
