import { evaluateRequestSchema } from '../../../lib/schemas/clinical';
import { endpoint } from '../../../server/http/endpoint';
import { evaluateMeasurements } from '../../../server/services/clinical';

/** The clinical engine over HTTP, with the stored reference set (islands, integrations, tests). */
export const POST = endpoint(
  { roles: ['admin', 'sonographer', 'radiologist'], body: evaluateRequestSchema, maxBodyBytes: 128 * 1024 },
  async ({ body }) => ({ result: await evaluateMeasurements(body) }),
);
