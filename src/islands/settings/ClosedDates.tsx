import { useState } from 'react';
import { formatDay } from '../../lib/time';

interface Props {
  dates: string[];
  /** The clinic's today (YYYY-MM-DD): earlier dates are listed as past. */
  today: string;
  errors?: Array<{ message?: string } | undefined> | { message?: string };
  onChange: (dates: string[]) => void;
}

/** The dates the clinic is closed (holidays, training days): add and remove. */
export function ClosedDates({ dates, today, errors, onChange }: Props) {
  const [draft, setDraft] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const itemError = (i: number) => (Array.isArray(errors) ? errors[i]?.message : undefined);
  const listError = !Array.isArray(errors) ? errors?.message : undefined;

  const add = () => {
    if (!/^\d{4}-\d{2}-\d{2}$/.test(draft)) return setProblem('Choose a date first.');
    if (dates.includes(draft)) return setProblem(`${formatDay(draft)} is already in the list.`);
    setProblem(null);
    onChange([...dates, draft].sort());
    setDraft('');
  };

  return (
    <fieldset className="space-y-3">
      <legend className="field-label">Closed dates</legend>
      <p className="text-xs text-ink-500">No bookings or free-time suggestions on these days. Adding a date does not cancel what is already booked on it.</p>
      <div className="flex flex-wrap items-end gap-2">
        <div>
          <label htmlFor="closed-date-new" className="text-xs text-ink-600">Add a closed date</label>
          <input
            id="closed-date-new"
            type="date"
            className="field-input w-44"
            value={draft}
            onChange={(e) => setDraft(e.target.value)}
            onKeyDown={(e) => {
              if (e.key === 'Enter') {
                e.preventDefault();
                add();
              }
            }}
            aria-invalid={!!problem}
          />
        </div>
        <button type="button" className="btn-quiet" onClick={add}>Add date</button>
      </div>
      {problem && <p className="field-error" role="alert">{problem}</p>}
      {listError && <p className="field-error" role="alert">{listError}</p>}
      {dates.length === 0 ? (
        <p className="text-sm text-ink-500">No closed dates.</p>
      ) : (
        <ul className="flex flex-wrap gap-2" aria-label="Closed dates">
          {dates.map((d, i) => (
            <li key={d} className={`flex items-center gap-1 rounded-full py-0.5 pr-1 pl-3 text-sm ring-1 ${d < today ? 'bg-ink-50 text-ink-500 ring-ink-100' : 'bg-dune-50 text-ink-800 ring-dune-300'}`}>
              <span>{formatDay(d)}{d < today && <span className="sr-only"> (past)</span>}</span>
              <button type="button" className="rounded-full px-1.5 text-ink-500 hover:bg-white hover:text-high-800" onClick={() => onChange(dates.filter((x) => x !== d))} aria-label={`Remove ${formatDay(d)}`}>
                ×
              </button>
              {itemError(i) && <span className="field-error mt-0 text-xs" role="alert">{itemError(i)}</span>}
            </li>
          ))}
        </ul>
      )}
    </fieldset>
  );
}
