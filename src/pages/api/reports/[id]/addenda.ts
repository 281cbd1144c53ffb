import { addendumSchema } from '../../../../lib/schemas/reports';
import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { addAddendum } from '../../../../server/services/report-additions';

/** An addendum to a signed report: signed with the password again; the report becomes amended and the referrer is told again. */
export const POST = endpoint({ roles: ['radiologist'], params: idParamsSchema, body: addendumSchema }, async ({ user, params, body, requestId }) => ({
  report: await addAddendum(user, params.id, body, requestId),
}));
