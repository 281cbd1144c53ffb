import { queryOptions } from '@tanstack/react-query';
import { api, qs } from '../api-client';
import type { WorklistQuery, WorklistRow } from '../schemas/exams';

/** How often lists of exams refresh themselves, so desk and rooms see the same state. */
export const LIVE_REFRESH_MS = 4_000;

/** One page of a day's worklist; refreshes itself every few seconds. */
export function worklistQuery(params: Partial<WorklistQuery>) {
  return queryOptions({
    queryKey: ['worklist', params] as const,
    queryFn: ({ signal }) => api<{ rows: WorklistRow[]; total: number }>(`/api/worklist${qs(params)}`, { signal }),
    refetchInterval: LIVE_REFRESH_MS,
    placeholderData: (previous) => previous,
  });
}

export interface SlotSuggestion {
  start: string;
  day: string;
  time: string;
}

/** Free starts for an exam type with a room, scanner and sonographer. */
export function slotsQuery(params: { examTypeId?: number; roomId?: number; scannerId?: number; sonographerId?: number; from?: string; excludeExamId?: number }) {
  const ready = Boolean(params.examTypeId && params.roomId && params.scannerId && params.sonographerId);
  return queryOptions({
    queryKey: ['slots', params] as const,
    queryFn: ({ signal }) => api<{ slots: SlotSuggestion[] }>(`/api/slots${qs(params)}`, { signal }),
    enabled: ready,
    staleTime: 2_000,
  });
}
