import { queryOptions } from '@tanstack/react-query';
import { api, qs } from '../api-client';
import type { DuplicateQuery, PatientListQuery, PatientListResult, PatientRecord, PatientSummary } from '../schemas/patients';

/** One page of the patient search; creating or changing a patient invalidates ['patients']. */
export function patientsQuery(params: Partial<PatientListQuery>) {
  return queryOptions({
    queryKey: ['patients', 'list', params] as const,
    queryFn: ({ signal }) => api<PatientListResult>(`/api/patients${qs(params)}`, { signal }),
    placeholderData: (previous) => previous,
  });
}

/** One patient record. */
export function patientQuery(id: number) {
  return queryOptions({
    queryKey: ['patients', 'record', id] as const,
    queryFn: ({ signal }) => api<{ patient: PatientRecord }>(`/api/patients/${id}`, { signal }).then((r) => r.patient),
  });
}

/** Records that may be the same person; asked fresh every time the form is about to save. */
export function patientDuplicatesQuery(params: DuplicateQuery) {
  return queryOptions({
    queryKey: ['patients', 'duplicates', params] as const,
    queryFn: ({ signal }) =>
      api<{ candidates: PatientSummary[] }>(`/api/patients/duplicates${qs({ ...params })}`, { signal }).then((r) => r.candidates),
    staleTime: 0,
  });
}
