import { versionOnlySchema } from '../../../../lib/schemas/reports';
import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { startExam } from '../../../../server/services/reports';

/** "Start scan": arrived → in-progress, and the exam's draft report is opened. */
export const POST = endpoint({ roles: ['sonographer', 'admin'], params: idParamsSchema, body: versionOnlySchema }, async ({ user, params, body, requestId }) =>
  startExam(user, params.id, body.version, requestId),
);
