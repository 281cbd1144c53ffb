import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { openAttachment } from '../../../../server/services/attachments';
import { sendStoredFile } from '../../../../server/storage/send';

/** The file exactly as it was stored (DICOM, PNG or JPEG). */
export const GET = endpoint({ roles: ['admin', 'sonographer', 'radiologist'], params: idParamsSchema }, async ({ params, requestId, context }) =>
  sendStoredFile(await openAttachment(params.id, 'file', requestId), context.request),
);
