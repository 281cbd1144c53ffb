import { createReferrerSchema, referrerListQuerySchema } from '../../../lib/schemas/referrers';
import { endpoint } from '../../../server/http/endpoint';
import { json } from '../../../server/http/responses';
import { createReferrer, listReferrers } from '../../../server/services/referrers';

// Also the booking form's picker: GET /api/referrers?active=true&q=…
export const GET = endpoint(
  { roles: ['admin', 'frontdesk', 'sonographer', 'radiologist'], query: referrerListQuerySchema },
  async ({ query }) => listReferrers(query),
);

export const POST = endpoint({ roles: ['admin', 'frontdesk'], body: createReferrerSchema }, async ({ user, body, requestId }) =>
  json({ referrer: await createReferrer(user, body, requestId) }, 201),
);
