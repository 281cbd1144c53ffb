import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { openAttachment } from '../../../../server/services/attachments';
import { sendStoredFile } from '../../../../server/storage/send';

/** A small JPEG of the image (404 when none could be made, e.g. for compressed DICOM). */
export const GET = endpoint({ roles: ['admin', 'sonographer', 'radiologist'], params: idParamsSchema }, async ({ params, requestId, context }) =>
  sendStoredFile(await openAttachment(params.id, 'thumbnail', requestId), context.request),
);
