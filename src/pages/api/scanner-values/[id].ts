import { scannerValueDecisionSchema } from '../../../lib/schemas/scanner-values';
import { idParamsSchema } from '../../../lib/schemas/users';
import { endpoint } from '../../../server/http/endpoint';
import { decideValue } from '../../../server/services/scanner-values';

/** Accept or reject one value offered from a scanner. */
export const POST = endpoint({ roles: ['sonographer', 'admin'], params: idParamsSchema, body: scannerValueDecisionSchema }, async ({ user, params, body, requestId }) => ({
  value: await decideValue(user, params.id, body, requestId),
}));
