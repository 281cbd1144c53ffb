import { claimSchema } from '../../../../lib/schemas/reports';
import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { claimReport } from '../../../../server/services/reading';

/** Opening a preliminary report claims it for the reading physician (or takes it over, when asked). */
export const POST = endpoint({ roles: ['radiologist'], params: idParamsSchema, body: claimSchema }, async ({ user, params, body, requestId }) => ({
  report: await claimReport(user, params.id, body.takeOver, requestId),
}));
