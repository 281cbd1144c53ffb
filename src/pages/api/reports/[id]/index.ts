import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { getReport } from '../../../../server/services/reports';

export const GET = endpoint({ roles: ['admin', 'sonographer', 'radiologist'], params: idParamsSchema }, async ({ params }) => ({ report: await getReport(params.id) }));
