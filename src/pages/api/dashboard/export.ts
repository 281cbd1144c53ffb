import { csvFileName, toCsv } from '../../../lib/dashboard/csv';
import { dashboardExportSchema } from '../../../lib/schemas/dashboard';
import { endpoint } from '../../../server/http/endpoint';
import { dashboardTable } from '../../../server/services/dashboard';

/** One table of the dashboard as a CSV file, exactly as the dashboard shows it. */
export const GET = endpoint({ roles: ['admin'], query: dashboardExportSchema }, async ({ query }) =>
  new Response(toCsv(await dashboardTable(query.table, query)), {
    headers: {
      'Content-Type': 'text/csv; charset=utf-8',
      'Content-Disposition': `attachment; filename="${csvFileName(query.table, query.from, query.to)}"`,
      'Cache-Control': 'no-store',
    },
  }),
);
