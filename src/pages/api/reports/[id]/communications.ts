import { communicationSchema } from '../../../../lib/schemas/reports';
import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { recordCommunication } from '../../../../server/services/report-additions';

/** Records an urgent finding told directly to a clinician (who, how, when, read back). */
export const POST = endpoint({ roles: ['radiologist'], params: idParamsSchema, body: communicationSchema }, async ({ user, params, body, requestId }) => ({
  report: await recordCommunication(user, params.id, body, requestId),
}));
