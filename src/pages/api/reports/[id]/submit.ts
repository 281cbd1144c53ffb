import { versionOnlySchema } from '../../../../lib/schemas/reports';
import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { submitPreliminary } from '../../../../server/services/reports';

/** "Submit preliminary": required measurements checked, findings generated, exam completed. */
export const POST = endpoint({ roles: ['sonographer'], params: idParamsSchema, body: versionOnlySchema }, async ({ user, params, body, requestId }) => ({
  report: await submitPreliminary(user, params.id, body.version, requestId),
}));
