import { useState } from 'react';
import { api, ApiError } from '../lib/api-client';

/** "Start scan" on an arrived exam: it moves to in-progress and its report form opens. */
export default function StartScan({ examId, examVersion }: { examId: number; examVersion: number }) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  return (
    <div className="space-y-2">
      {problem && <p role="alert" className="field-error">{problem}</p>}
      <button
        type="button"
        className="btn-primary"
        disabled={busy}
        onClick={async () => {
          setBusy(true);
          setProblem(null);
          try {
            await api(`/api/exams/${examId}/start`, { method: 'POST', body: { version: examVersion } });
            window.location.assign(`/exams/${examId}/report`);
          } catch (e) {
            setProblem(e instanceof ApiError ? e.message : 'The scan could not be started.');
            setBusy(false);
          }
        }}
      >
        {busy ? 'Starting…' : 'Start scan'}
      </button>
    </div>
  );
}
