import { rescheduleSchema } from '../../../../lib/schemas/exams';
import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { rescheduleExam } from '../../../../server/services/booking';

export const POST = endpoint({ roles: ['admin', 'frontdesk'], params: idParamsSchema, body: rescheduleSchema }, async ({ user, params, body, requestId }) => ({
  exam: await rescheduleExam(user, params.id, body, requestId),
}));
