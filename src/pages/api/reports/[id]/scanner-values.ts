import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { offeredValues } from '../../../../server/services/scanner-values';

/** Values offered from the scanner's structured reports, waiting for the sonographer's decision. */
export const GET = endpoint({ roles: ['sonographer', 'admin', 'radiologist'], params: idParamsSchema }, async ({ params }) => ({ values: await offeredValues(params.id) }));
