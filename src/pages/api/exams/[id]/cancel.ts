import { cancelSchema } from '../../../../lib/schemas/exams';
import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { cancelExam } from '../../../../server/services/cancellation';

export const POST = endpoint({ roles: ['admin', 'frontdesk'], params: idParamsSchema, body: cancelSchema }, async ({ user, params, body, requestId }) => ({
  cancellation: await cancelExam(user, params.id, body, requestId),
}));
