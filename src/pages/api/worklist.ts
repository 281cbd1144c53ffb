import { worklistQuerySchema } from '../../lib/schemas/exams';
import { STAFF } from '../../server/auth/roles';
import { endpoint } from '../../server/http/endpoint';
import { clinicProfile } from '../../server/services/settings';
import { cachedWorklist } from '../../server/services/worklist-cache';

/** A clinic day's exams, paged, sorted and filtered on the server. */
export const GET = endpoint({ roles: STAFF, query: worklistQuerySchema }, async ({ query }) =>
  new Response(await cachedWorklist(query, (await clinicProfile()).timeZone), {
    headers: { 'Content-Type': 'application/json; charset=utf-8', 'Cache-Control': 'no-store' },
  }),
);
