import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { notFound } from '../../../../server/http/errors';
import { reportPdf } from '../../../../server/pdf/report-pdf';
import { pdfResponse } from '../../../../server/pdf/response';
import { audit } from '../../../../server/services/audit';
import { referrerMayRead } from '../../../../server/services/report-delivery';

/**
 * The signed report as a PDF (409 until it is signed). A referrer gets only the reports of the
 * patients they referred; any other is 404, as on the report page. Each download is audited.
 */
export const GET = endpoint({ roles: ['admin', 'radiologist', 'referrer'], params: idParamsSchema }, async ({ user, params, requestId }) => {
  if (user.role === 'referrer' && (await referrerMayRead(user, params.id)) === null) throw notFound('The report');
  const file = await reportPdf(params.id);
  await audit({ actorUserId: user.id, action: 'report.pdf', entityType: 'report', entityId: params.id, detail: { bytes: file.bytes.byteLength }, requestId });
  return pdfResponse(file);
});
