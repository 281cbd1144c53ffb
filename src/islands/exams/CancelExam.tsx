import { useState } from 'react';
import { api, ApiError } from '../../lib/api-client';
import { formatMoney } from '../../lib/booking/refunds';

interface Props {
  examId: number;
  version: number;
  /** What the policy will do, worked out by the page from the same rule the server applies. */
  preview: { refundCents: number; keptCents: number; reason: string; currency: string } | null;
  onDone: (message: string) => void;
}

/** Cancels with a reason, showing what happens to money already paid before it is confirmed. */
export function CancelExam({ examId, version, preview, onDone }: Props) {
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  if (!open) return <button type="button" className="btn-quiet text-high-800" onClick={() => setOpen(true)}>Cancel exam…</button>;
  return (
    <form className="w-full space-y-3 rounded-md border border-high-200 bg-high-50/40 p-4" noValidate onSubmit={async (e) => {
      e.preventDefault();
      setBusy(true);
      setProblem(null);
      try {
        const { cancellation: c } = await api<{ cancellation: { refundCents: number; refundStatus: string; policy: string } }>(`/api/exams/${examId}/cancel`, { method: 'POST', body: { version, reason } });
        onDone(c.refundCents > 0 ? `Cancelled. ${c.policy} Refund ${c.refundStatus === 'sent' ? 'sent' : 'queued; it will be sent as soon as the payment service answers'}.` : `Cancelled. ${preview?.keptCents ? c.policy : ''}`.trim());
      } catch (err) {
        setProblem(err instanceof ApiError ? (err.fields.reason ?? err.message) : 'The exam could not be cancelled.');
      } finally {
        setBusy(false);
      }
    }}>
      <label htmlFor="cancel-reason" className="field-label">Reason for cancelling</label>
      <textarea id="cancel-reason" className="field-input" rows={2} value={reason} onChange={(e) => setReason(e.target.value)} aria-invalid={!!problem} />
      {preview && (
        <p className="text-sm text-ink-700">
          {preview.reason}{' '}
          {preview.refundCents > 0 ? `Refund: ${formatMoney(preview.refundCents, preview.currency)}.` : ''}
          {preview.keptCents > 0 ? ` Kept: ${formatMoney(preview.keptCents, preview.currency)}.` : ''}
        </p>
      )}
      {problem && <p role="alert" className="field-error">{problem}</p>}
      <div className="flex gap-2">
        <button type="submit" className="btn-danger" disabled={busy}>{busy ? 'Cancelling…' : 'Confirm cancellation'}</button>
        <button type="button" className="btn-quiet" onClick={() => setOpen(false)}>Keep the booking</button>
      </div>
    </form>
  );
}
