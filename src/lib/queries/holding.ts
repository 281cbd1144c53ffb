import { queryOptions } from '@tanstack/react-query';
import { api, qs } from '../api-client';
import type { HeldCandidate, HeldList } from '../schemas/holding';
import { LIVE_REFRESH_MS } from './exams';

/** The holding list; refreshes itself like the worklist, so a newly held object shows up by itself. */
export function heldQuery() {
  return queryOptions({
    queryKey: ['holding'] as const,
    queryFn: ({ signal }) => api<HeldList>('/api/holding', { signal }),
    refetchInterval: LIVE_REFRESH_MS,
    placeholderData: (previous) => previous,
  });
}

/** The exam with a typed accession number, as a candidate for one held object. */
export function typedCandidateQuery(attachmentId: number, accession: string) {
  return queryOptions({
    queryKey: ['holding', attachmentId, 'candidates', accession] as const,
    queryFn: ({ signal }) => api<{ candidates: HeldCandidate[] }>(`/api/holding/${attachmentId}/candidates${qs({ accession })}`, { signal }).then((r) => r.candidates),
    enabled: accession !== '',
    staleTime: 2_000,
    retry: false,
  });
}
