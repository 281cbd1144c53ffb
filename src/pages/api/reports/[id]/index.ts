import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { audit } from '../../../../server/services/audit';
import { getReport } from '../../../../server/services/reports';

/** A report as stored; each read is in the audit trail. */
export const GET = endpoint({ roles: ['admin', 'sonographer', 'radiologist'], params: idParamsSchema }, async ({ user, params, requestId }) => {
  const report = await getReport(params.id);
  await audit({ actorUserId: user.id, action: 'report.view', entityType: 'report', entityId: report.id, detail: { examId: report.examId, status: report.status }, requestId });
  return { report };
});
