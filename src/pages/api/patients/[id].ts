import { patientIdParamsSchema, updatePatientSchema } from '../../../lib/schemas/patients';
import { endpoint } from '../../../server/http/endpoint';
import { getPatient, updatePatient } from '../../../server/services/patients';

export const GET = endpoint(
  { roles: ['admin', 'frontdesk', 'sonographer', 'radiologist'], params: patientIdParamsSchema },
  async ({ params }) => ({ patient: await getPatient(params.id) }),
);

export const PATCH = endpoint(
  { roles: ['admin', 'frontdesk'], params: patientIdParamsSchema, body: updatePatientSchema },
  async ({ user, params, body, requestId }) => ({ patient: await updatePatient(user, params.id, body, requestId) }),
);
