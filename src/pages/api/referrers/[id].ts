import { referrerIdParamsSchema, updateReferrerSchema } from '../../../lib/schemas/referrers';
import { endpoint } from '../../../server/http/endpoint';
import { updateReferrer } from '../../../server/services/referrers';

export const PATCH = endpoint(
  { roles: ['admin', 'frontdesk'], params: referrerIdParamsSchema, body: updateReferrerSchema },
  async ({ user, params, body, requestId }) => ({ referrer: await updateReferrer(user, params.id, body, requestId) }),
);
