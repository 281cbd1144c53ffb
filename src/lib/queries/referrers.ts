import { queryOptions } from '@tanstack/react-query';
import { api, qs } from '../api-client';
import type { ReferrerListParams, ReferrerRow } from '../schemas/referrers';

/**
 * One page of the referrer directory, or the picker's choices with `{ active: 'true', q }`;
 * creating or changing an entry invalidates ['referrers'].
 */
export function referrersQuery(params: Partial<ReferrerListParams>) {
  return queryOptions({
    queryKey: ['referrers', params] as const,
    queryFn: ({ signal }) => api<{ rows: ReferrerRow[]; total: number }>(`/api/referrers${qs(params)}`, { signal }),
    placeholderData: (previous) => previous,
  });
}
