import { useMutation, useQuery } from '@tanstack/react-query';
import { useEffect, useId, useState } from 'react';
import { api, ApiError } from '../../lib/api-client';
import { typedCandidateQuery } from '../../lib/queries/holding';
import type { AttachHeldAnswer, CandidateReason, HeldCandidate, HeldObject } from '../../lib/schemas/holding';

interface Props {
  held: HeldObject;
  onDone: (message: string) => void;
  onGone: (message: string) => void;
  onClose: () => void;
}

const REASON_LABELS: Record<CandidateReason, string> = {
  accession: 'same accession number',
  'study-uid': 'same Study Instance UID',
  'patient-day': 'same patient ID, same day',
  typed: 'accession number you typed',
};

/**
 * Picks the exam a held object belongs to: one of the likely exams, or one found by a typed
 * accession number. When the server says the identifiers differ, its message is shown and only
 * a second, explicit "Attach anyway" sends the confirmation.
 */
export function AttachPanel({ held, onDone, onGone, onClose }: Props) {
  const ids = useId();
  const [examId, setExamId] = useState<number | null>(held.candidates.find((c) => c.identityMatches && c.takesImages)?.examId ?? null);
  const [typed, setTyped] = useState('');
  const [lookedUp, setLookedUp] = useState('');
  const [mismatch, setMismatch] = useState<string | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const lookup = useQuery(typedCandidateQuery(held.id, lookedUp));
  const found = lookup.data?.filter((c) => !held.candidates.some((h) => h.examId === c.examId)) ?? [];
  const options = [...held.candidates, ...found];

  const attach = useMutation({
    mutationFn: (confirmMismatch: boolean) => api<{ attached: AttachHeldAnswer }>(`/api/holding/${held.id}/attach`, { method: 'POST', body: { examId, confirmMismatch } }),
    onSuccess: ({ attached }) => onDone(`Attached to exam ${attached.accessionNumber}${attached.mismatchConfirmed ? ' (identifiers differed; you confirmed it)' : ''}.`),
    onError: (e) => {
      if (e instanceof ApiError && e.code === 'IDENTITY_MISMATCH') return setMismatch(e.message);
      if (e instanceof ApiError && e.status === 409) return onGone(e.message);
      setProblem(e instanceof ApiError ? (e.fields.examId ?? e.message) : 'The object could not be attached.');
    },
  });
  const choose = (id: number) => {
    setExamId(id);
    setMismatch(null);
    setProblem(null);
  };
  // The exam found by a typed accession is chosen at once (it may already be listed above).
  useEffect(() => {
    const first = lookup.data?.[0];
    if (first?.takesImages) choose(first.examId);
  }, [lookup.data]);

  return (
    <div className="space-y-3">
      <fieldset>
        <legend className="field-label">Exam to attach it to</legend>
        {options.length === 0 && <p className="text-sm text-ink-500">No likely exam was found. Type the accession number of the right exam.</p>}
        <ul className="mt-1 space-y-1">
          {options.map((c) => (
            <li key={c.examId}>
              <CandidateOption candidate={c} name={`${ids}-exam`} checked={examId === c.examId} onChoose={() => choose(c.examId)} />
            </li>
          ))}
        </ul>
      </fieldset>

      <form
        className="flex flex-wrap items-end gap-2"
        noValidate
        onSubmit={(e) => {
          e.preventDefault();
          setLookedUp(typed.trim());
        }}
      >
        <div>
          <label htmlFor={`${ids}-accession`} className="field-label">Or find by accession number</label>
          <input id={`${ids}-accession`} className="field-input font-mono" value={typed} onChange={(e) => setTyped(e.target.value)} placeholder="A2612020007" autoComplete="off"
            aria-invalid={lookup.isError} aria-describedby={`${ids}-lookup`} />
        </div>
        <button type="submit" className="btn-quiet" disabled={typed.trim() === ''}>Find exam</button>
        <p id={`${ids}-lookup`} className="w-full text-sm" aria-live="polite">
          {lookup.isFetching && <span className="text-ink-500">Looking…</span>}
          {lookup.isError && <span className="field-error">{lookup.error instanceof ApiError ? (lookup.error.fields.accession ?? lookup.error.message) : 'The lookup failed.'}</span>}
          {lookup.data && lookup.data.length === 0 && <span className="text-ink-600">No exam has accession number {lookedUp.toUpperCase()}.</span>}
        </p>
      </form>

      {mismatch && (
        <div role="alert" className="space-y-2 rounded-md border border-high-200 bg-high-50 p-3 text-sm text-high-800">
          <p>{mismatch}</p>
          <button type="button" className="btn-danger" disabled={attach.isPending} onClick={() => attach.mutate(true)}>Attach anyway</button>
        </div>
      )}
      {problem && <p role="alert" className="field-error">{problem}</p>}
      <div className="flex gap-2">
        {!mismatch && (
          <button type="button" className="btn-primary" disabled={examId === null || attach.isPending} onClick={() => attach.mutate(false)}>
            {attach.isPending ? 'Attaching…' : 'Attach'}
          </button>
        )}
        <button type="button" className="btn-quiet" onClick={onClose}>Cancel</button>
      </div>
    </div>
  );
}

function CandidateOption({ candidate: c, name, checked, onChoose }: { candidate: HeldCandidate; name: string; checked: boolean; onChoose: () => void }) {
  return (
    <label className={`flex items-start gap-2 rounded-md px-2 py-1.5 text-sm ${c.takesImages ? 'cursor-pointer hover:bg-ink-50' : 'opacity-60'}`}>
      <input type="radio" name={name} className="mt-1" checked={checked} disabled={!c.takesImages} onChange={onChoose} />
      <span>
        <span className="font-medium text-ink-900">{c.accessionNumber} · {c.patientName} ({c.mrn})</span>
        <span className="block text-xs text-ink-600">
          {c.examType} · {c.scheduledLabel} · {c.statusLabel} · {REASON_LABELS[c.reason]}
        </span>
        {!c.takesImages && <span className="block text-xs text-ink-600">Takes no images in this status.</span>}
        {c.takesImages && !c.identityMatches && <span className="block text-xs font-medium text-high-800">The file’s patient ID or accession differs from this exam’s.</span>}
      </span>
    </label>
  );
}
