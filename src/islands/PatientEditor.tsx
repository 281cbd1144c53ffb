import { QueryClientProvider, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { queryClient } from '../lib/query-client';
import { patientQuery } from '../lib/queries/patients';
import { formatIsoDate } from '../lib/schemas/patient-search';
import { SEX_LABELS, type PatientRecord } from '../lib/schemas/patients';
import { ageOn } from '../lib/time';
import { PatientForm } from './patients/PatientForm';

interface Props {
  patient: PatientRecord;
  /** Front desk and manager edit; other roles read. */
  canEdit: boolean;
  /** Today in the clinic's time zone (YYYY-MM-DD), for the age. */
  today: string;
  /** A line to announce on arrival, e.g. after the record was created. */
  notice?: string;
}

function Details({ patient, canEdit, today, notice }: Props) {
  const client = useQueryClient();
  const [editing, setEditing] = useState(false);
  const address = [patient.addressLine, [patient.postalCode, patient.city].filter(Boolean).join(' ')].filter(Boolean).join(', ');

  return (
    <div className="space-y-4">
      {notice && <p role="status" className="rounded-md bg-crest-50 px-3 py-2 text-sm text-crest-800">{notice}</p>}
      <section aria-labelledby="patient-details-title" className="card p-5">
        <div className="flex items-start justify-between gap-3">
          <h2 id="patient-details-title" className="text-base font-semibold">Details</h2>
          {canEdit && !editing && (
            <button type="button" className="btn-quiet py-1" onClick={() => setEditing(true)}>
              Edit details
            </button>
          )}
        </div>
        <dl className="mt-3 grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[7rem_minmax(0,1fr)] lg:grid-cols-[7rem_minmax(0,1fr)_7rem_minmax(0,1fr)] [&_dd]:break-words">
          <dt className="text-ink-500">MRN</dt>
          <dd className="font-mono">{patient.mrn}</dd>
          <dt className="text-ink-500">Birth date</dt>
          <dd>{formatIsoDate(patient.birthDate)} <span className="text-ink-500">({ageOn(patient.birthDate, today)} years)</span></dd>
          <dt className="text-ink-500">Sex</dt>
          <dd>{SEX_LABELS[patient.sex]}</dd>
          <dt className="text-ink-500">Phone</dt>
          <dd>{patient.phone ?? '—'}</dd>
          <dt className="text-ink-500">E-mail</dt>
          <dd>{patient.email ?? '—'}</dd>
          <dt className="text-ink-500">Address</dt>
          <dd>{address || '—'}</dd>
        </dl>
      </section>
      {editing && (
        <PatientForm
          patient={patient}
          // A reload shows the saved record everywhere on the page (heading, details, exams).
          onSaved={(p) => window.location.assign(`/patients/${p.id}?saved=1`)}
          onCancel={() => setEditing(false)}
          loadLatest={() => client.fetchQuery({ ...patientQuery(patient.id), staleTime: 0 })}
        />
      )}
    </div>
  );
}

export default function PatientEditor(props: Props) {
  return (
    <QueryClientProvider client={queryClient}>
      <Details {...props} />
    </QueryClientProvider>
  );
}
