import { createPatientSchema, patientListQuerySchema } from '../../../lib/schemas/patients';
import { endpoint } from '../../../server/http/endpoint';
import { json } from '../../../server/http/responses';
import { createPatient, searchPatients } from '../../../server/services/patients';

export const GET = endpoint(
  { roles: ['admin', 'frontdesk', 'sonographer', 'radiologist'], query: patientListQuerySchema },
  async ({ query }) => searchPatients(query),
);

export const POST = endpoint({ roles: ['admin', 'frontdesk'], body: createPatientSchema }, async ({ user, body, requestId }) =>
  json({ patient: await createPatient(user, body, requestId) }, 201),
);
