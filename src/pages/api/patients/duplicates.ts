import { duplicateQuerySchema } from '../../../lib/schemas/patients';
import { endpoint } from '../../../server/http/endpoint';
import { findDuplicates } from '../../../server/services/patients';

// Asked by the patient form before it saves; only the roles that may save need it.
export const GET = endpoint({ roles: ['admin', 'frontdesk'], query: duplicateQuerySchema }, async ({ query }) => ({
  candidates: await findDuplicates(query),
}));
