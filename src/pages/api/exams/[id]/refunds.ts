import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { sendPendingRefunds } from '../../../../server/services/payments';

/** Sends the exam's waiting refunds now (the worker also retries them). */
export const POST = endpoint({ roles: ['admin', 'frontdesk'], params: idParamsSchema }, async ({ params }) => ({ settled: await sendPendingRefunds(params.id) }));
