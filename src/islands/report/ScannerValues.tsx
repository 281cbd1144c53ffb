import { useCallback, useEffect, useState } from 'react';
import { api, ApiError } from '../../lib/api-client';
import type { ScannerValueDto } from '../../lib/schemas/scanner-values';

interface Props {
  reportId: number;
  /** What the form holds now, as typed, by field code. */
  typed: Readonly<Record<string, string>>;
  /** Puts an accepted value into the form (marked "from the scanner"). */
  onUse: (value: ScannerValueDto) => void;
}

/** How often the form looks for values a scanner has sent since (structured reports arrive during the scan). */
const LOOK_AGAIN_MS = 8_000;

/**
 * Values read from the scanner's structured reports, offered one by one: "Use" puts the value
 * into its field and records the acceptance; "Reject" records the refusal. Nothing a scanner
 * sends goes into the form by itself, and a value already typed is replaced only when the
 * sonographer chooses to.
 */
export function ScannerValues({ reportId, typed, onUse }: Props) {
  const [values, setValues] = useState<ScannerValueDto[]>([]);
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState<number | null>(null);

  const load = useCallback(
    async (signal?: AbortSignal) => {
      try {
        const answer = await api<{ values: ScannerValueDto[] }>(`/api/reports/${reportId}/scanner-values`, { signal });
        setValues(answer.values);
      } catch (error) {
        if ((error as Error).name !== 'AbortError') setMessage(error instanceof ApiError ? error.message : 'Values from the scanner could not be loaded.');
      }
    },
    [reportId],
  );

  useEffect(() => {
    const controller = new AbortController();
    void load(controller.signal);
    const timer = window.setInterval(() => void load(controller.signal), LOOK_AGAIN_MS);
    return () => {
      controller.abort();
      window.clearInterval(timer);
    };
  }, [load]);

  const decide = async (value: ScannerValueDto, decision: 'accept' | 'reject') => {
    setBusy(value.id);
    setMessage(null);
    if (decision === 'accept') onUse(value);
    try {
      await api(`/api/scanner-values/${value.id}`, { method: 'POST', body: { decision } });
      setValues((all) => all.filter((v) => v.id !== value.id));
    } catch (error) {
      setMessage(error instanceof ApiError ? error.message : 'The decision could not be recorded; try again.');
      void load();
    } finally {
      setBusy(null);
    }
  };

  if (values.length === 0 && message === null) return null;
  return (
    <section className="card space-y-3 p-4" aria-labelledby="scanner-values-heading" data-testid="scanner-values">
      <div>
        <h2 id="scanner-values-heading" className="text-sm font-semibold text-ink-900">From the scanner</h2>
        <p className="text-xs text-ink-500">Measurements the scanner sent in its structured report. Check each one against the image before using it.</p>
      </div>
      {message && <p role="alert" className="rounded-md bg-high-50 px-3 py-2 text-sm text-high-800">{message}</p>}
      <ul className="divide-y divide-ink-100">
        {values.map((v) => {
          const current = typed[v.fieldCode] ?? '';
          const differs = current !== '' && Number(current.replace(',', '.')) !== v.value;
          return (
            <li key={v.id} className="space-y-1.5 py-2.5 first:pt-0 last:pb-0">
              <div className="flex items-baseline justify-between gap-3">
                <span className="text-sm text-ink-800">{v.label}</span>
                <span className="text-sm font-semibold tabular-nums text-ink-900">{v.valueText}</span>
              </div>
              <p className="text-xs text-ink-500">Sent as {v.sentAs}; received {v.receivedLabel}.</p>
              {differs && <p className="text-xs text-dune-700">You typed {current} {v.unit}; using the scanner’s value replaces it.</p>}
              <div className="flex gap-2">
                <button type="button" className="btn-primary px-2.5 py-1 text-xs" disabled={busy !== null} onClick={() => void decide(v, 'accept')} aria-label={`Use ${v.valueText} for ${v.label}`}>
                  {differs ? 'Use instead' : 'Use'}
                </button>
                <button type="button" className="btn-quiet px-2.5 py-1 text-xs" disabled={busy !== null} onClick={() => void decide(v, 'reject')} aria-label={`Reject ${v.valueText} for ${v.label}`}>
                  Reject
                </button>
              </div>
            </li>
          );
        })}
      </ul>
    </section>
  );
}
