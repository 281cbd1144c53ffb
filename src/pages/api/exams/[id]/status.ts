import { statusMoveSchema } from '../../../../lib/schemas/exams';
import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { moveExamStatus } from '../../../../server/services/booking';

/** Check-in (arrived) and no-show, from the worklist or the exam page. */
export const POST = endpoint({ roles: ['admin', 'frontdesk'], params: idParamsSchema, body: statusMoveSchema }, async ({ user, params, body, requestId }) => ({
  exam: await moveExamStatus(user, params.id, body.to, body.version, requestId),
}));
