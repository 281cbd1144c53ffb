import { idParamsSchema } from '../../../../lib/schemas/users';
import { STAFF } from '../../../../server/auth/roles';
import { endpoint } from '../../../../server/http/endpoint';
import { examDetail } from '../../../../server/services/exam-detail';
import { clinicProfile } from '../../../../server/services/settings';

export const GET = endpoint({ roles: STAFF, params: idParamsSchema }, async ({ params, user }) => {
  const detail = await examDetail(params.id, (await clinicProfile()).timeZone);
  // Money and patient contact details are the front desk's and the manager's business.
  if (user.role === 'sonographer' || user.role === 'radiologist') return { exam: { ...detail, ledger: [], messages: [] } };
  return { exam: detail };
});
