import { queryOptions } from '@tanstack/react-query';
import { api, qs } from '../api-client';
import type { DashboardDto, TableName } from '../dashboard/tables';
import type { DashboardPeriod } from '../schemas/dashboard';

/** The clinic dashboard for a period; past figures barely move, so it is kept a minute. */
export function dashboardQuery(period: DashboardPeriod) {
  return queryOptions({
    queryKey: ['dashboard', period] as const,
    queryFn: ({ signal }) => api<DashboardDto>(`/api/dashboard${qs({ ...period })}`, { signal }),
    staleTime: 60_000,
    placeholderData: (previous) => previous,
  });
}

/** Where a table's CSV is downloaded from. */
export function dashboardExportUrl(table: TableName, period: DashboardPeriod): string {
  return `/api/dashboard/export${qs({ table, ...period })}`;
}
