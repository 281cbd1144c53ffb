import { takePaymentSchema } from '../../../../lib/schemas/exams';
import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { examLedger, takePayment } from '../../../../server/services/payments';

export const GET = endpoint({ roles: ['admin', 'frontdesk'], params: idParamsSchema }, async ({ params }) => ({ ledger: await examLedger(params.id) }));

/** Takes the deposit or the balance by card. */
export const POST = endpoint({ roles: ['admin', 'frontdesk'], params: idParamsSchema, body: takePaymentSchema }, async ({ user, params, body, requestId }) => ({
  payment: await takePayment(user, params.id, body, requestId),
}));
