import { useMutation } from '@tanstack/react-query';
import { useId, useState } from 'react';
import { api, ApiError } from '../../lib/api-client';
import type { HeldObject } from '../../lib/schemas/holding';

interface Props {
  held: HeldObject;
  onDone: (message: string) => void;
  onGone: (message: string) => void;
  onClose: () => void;
}

/** Discards a held object with a reason (kept in the audit trail); its file is deleted. */
export function DiscardPanel({ held, onDone, onGone, onClose }: Props) {
  const id = useId();
  const [reason, setReason] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const discard = useMutation({
    mutationFn: () => api(`/api/holding/${held.id}/discard`, { method: 'POST', body: { reason } }),
    onSuccess: () => onDone('Discarded. The file was deleted; the audit trail keeps its identifiers and your reason.'),
    onError: (e) => {
      if (e instanceof ApiError && e.status === 409) return onGone(e.message);
      setProblem(e instanceof ApiError ? (e.fields.reason ?? e.message) : 'The object could not be discarded.');
    },
  });
  return (
    <form
      className="space-y-3"
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        setProblem(null);
        discard.mutate();
      }}
    >
      <div>
        <label htmlFor={`${id}-reason`} className="field-label">Reason for discarding</label>
        <textarea id={`${id}-reason`} className="field-input" rows={2} maxLength={200} value={reason} onChange={(e) => setReason(e.target.value)}
          aria-invalid={!!problem} aria-describedby={problem ? `${id}-problem` : undefined} />
        {problem && <p id={`${id}-problem`} role="alert" className="field-error">{problem}</p>}
      </div>
      <div className="flex gap-2">
        <button type="submit" className="btn-danger" disabled={discard.isPending}>{discard.isPending ? 'Discarding…' : 'Discard object'}</button>
        <button type="button" className="btn-quiet" onClick={onClose}>Keep it</button>
      </div>
    </form>
  );
}
