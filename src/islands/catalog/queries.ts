import { queryOptions } from '@tanstack/react-query';
import { api } from '../../lib/api-client';
import type { ActiveChangeResult, ExamTypeRow, ProbeRow, RoomRow, ScannerRow } from '../../lib/schemas/catalog-admin';

/** The four catalog lists, by their address under /api/admin/catalog. */
export interface CatalogRows {
  'exam-types': ExamTypeRow;
  rooms: RoomRow;
  scanners: ScannerRow;
  probes: ProbeRow;
}
export type CatalogList = keyof CatalogRows;

/**
 * One catalog list (small: tens of rows, so sorted in the browser). Every change invalidates
 * ['catalog'] as a whole, since the lists name each other (a room's scanners, a probe's scanner).
 */
export function catalogQuery<L extends CatalogList>(list: L) {
  return queryOptions({
    queryKey: ['catalog', list] as const,
    queryFn: ({ signal }) => api<{ rows: Array<CatalogRows[L]> }>(`/api/admin/catalog/${list}`, { signal }).then((r) => r.rows),
  });
}

/** Creates (no id) or edits (with the version it was opened with) one row. */
export function saveRow<L extends CatalogList>(list: L, body: object, existing?: { id: number; version: number }): Promise<{ row: CatalogRows[L] }> {
  return existing
    ? api(`/api/admin/catalog/${list}/${existing.id}`, { method: 'PUT', body: { ...body, version: existing.version } })
    : api(`/api/admin/catalog/${list}`, { method: 'POST', body });
}

/** Deactivates or reactivates one row (for a probe: out of service, back in service). */
export function setActive<L extends CatalogList>(list: L, row: { id: number; version: number }, active: boolean): Promise<ActiveChangeResult<CatalogRows[L]>> {
  return api(`/api/admin/catalog/${list}/${row.id}`, { method: 'PATCH', body: { version: row.version, active } });
}
