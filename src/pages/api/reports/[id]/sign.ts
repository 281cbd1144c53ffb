import { signSchema } from '../../../../lib/schemas/reports';
import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { signReport } from '../../../../server/services/reading';

/** "Sign": the password again, then the signature and `final` in one transaction. */
export const POST = endpoint({ roles: ['radiologist'], params: idParamsSchema, body: signSchema }, async ({ user, params, body, requestId }) => ({
  report: await signReport(user, params.id, body, requestId),
}));
