import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { patientsQuery } from '../../lib/queries/patients';
import { patientName, type PatientSummary } from '../../lib/schemas/patients';

/** Finds a patient by name, MRN or birth date and picks one. */
export function PatientPicker({ value, onChange, error }: { value: PatientSummary | null; onChange: (p: PatientSummary | null) => void; error?: string }) {
  const [q, setQ] = useState('');
  const { data, isFetching } = useQuery({ ...patientsQuery({ q, pageSize: 8 }), enabled: !value && q.trim().length >= 2 });
  if (value) {
    return (
      <div>
        <span className="field-label">Patient</span>
        <div className="mt-1 flex items-center justify-between rounded-md border border-ink-200 bg-ink-50 px-3 py-2 text-sm">
          <span><b>{patientName(value)}</b> · born {value.birthDate} · {value.mrn}</span>
          <button type="button" className="text-xs font-semibold text-crest-700 hover:underline" onClick={() => onChange(null)}>Change</button>
        </div>
      </div>
    );
  }
  return (
    <div>
      <label htmlFor="patient-search" className="field-label">Patient</label>
      <input id="patient-search" type="search" className="field-input" placeholder="Name, MRN or birth date" value={q} onChange={(e) => setQ(e.target.value)}
        aria-invalid={!!error} aria-describedby={error ? 'patient-error' : undefined} autoComplete="off" />
      {error && <p id="patient-error" className="field-error" role="alert">{error}</p>}
      {q.trim().length >= 2 && (
        <ul className="mt-1 max-h-56 overflow-auto rounded-md border border-ink-100 bg-white text-sm shadow-sm" aria-label="Matching patients" aria-busy={isFetching}>
          {data?.rows.length === 0 && <li className="px-3 py-2 text-ink-500">No patient matches. <a className="font-semibold text-crest-700 hover:underline" href="/patients">Register a new patient</a> first.</li>}
          {data?.rows.map((p) => (
            <li key={p.id}>
              <button type="button" className="w-full px-3 py-2 text-left hover:bg-crest-50 focus:bg-crest-50" onClick={() => onChange(p)}>
                <b>{patientName(p)}</b> <span className="text-ink-500">· born {p.birthDate} · {p.mrn}</span>
              </button>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
