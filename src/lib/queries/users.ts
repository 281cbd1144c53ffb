import { queryOptions } from '@tanstack/react-query';
import { api, qs } from '../api-client';
import type { UserListQuery, UserRow } from '../schemas/users';

/** TanStack Query options for one page of the staff list; mutations invalidate ['users']. */
export function usersQuery(params: Partial<UserListQuery>) {
  return queryOptions({
    queryKey: ['users', params] as const,
    queryFn: ({ signal }) => api<{ rows: UserRow[]; total: number }>(`/api/users${qs(params)}`, { signal }),
    placeholderData: (previous) => previous,
  });
}
