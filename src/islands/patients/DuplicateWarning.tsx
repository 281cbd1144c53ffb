import { useEffect, useRef } from 'react';
import { formatIsoDate } from '../../lib/schemas/patient-search';
import { patientName, type PatientSummary } from '../../lib/schemas/patients';

interface Props {
  candidates: PatientSummary[];
  saving: boolean;
  onConfirm: () => void;
  onDismiss: () => void;
}

/**
 * Shown when the person being saved may already have a record. Saving anyway is a
 * deliberate second click, never the default; opening an existing record is the first choice.
 */
export function DuplicateWarning({ candidates, saving, onConfirm, onDismiss }: Props) {
  const heading = useRef<HTMLHeadingElement>(null);
  useEffect(() => heading.current?.focus(), []);
  const one = candidates.length === 1;
  return (
    <section aria-labelledby="duplicate-title" className="rounded-md border border-dune-300 bg-dune-50 p-4 sm:col-span-2">
      <h3 id="duplicate-title" ref={heading} tabIndex={-1} className="text-sm font-semibold text-dune-700">
        Possible duplicate record
      </h3>
      <p role="alert" className="mt-1 text-sm text-ink-800">
        {one
          ? 'A patient with the same name and birth date already has a record. If this is the same person, open that record instead of making a new one.'
          : `${candidates.length} patients with the same name and birth date already have records. If this is one of them, open that record instead of making a new one.`}
      </p>
      <ul className="mt-3 divide-y divide-dune-100 rounded-md bg-white ring-1 ring-dune-100">
        {candidates.map((c) => (
          <li key={c.id} className="flex flex-wrap items-baseline gap-x-4 gap-y-1 px-3 py-2 text-sm">
            <a href={`/patients/${c.id}`} className="font-semibold text-crest-700 underline-offset-2 hover:underline">
              {patientName(c)}
            </a>
            <span>Born {formatIsoDate(c.birthDate)}</span>
            <span className="font-mono text-xs text-ink-600">MRN {c.mrn}</span>
          </li>
        ))}
      </ul>
      <div className="mt-3 flex flex-wrap gap-2">
        <button type="button" className="btn-quiet" disabled={saving} onClick={onConfirm}>
          This is a different person — save anyway
        </button>
        <button type="button" className="btn-quiet" onClick={onDismiss}>
          Back to the form
        </button>
      </div>
    </section>
  );
}
