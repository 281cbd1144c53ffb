import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { json } from '../../../../server/http/responses';
import { listAttachments, uploadAttachment } from '../../../../server/services/attachments';
import { readUploadedFile } from '../../../../server/storage/incoming';

/** The exam's images and DICOM objects. */
export const GET = endpoint({ roles: ['admin', 'sonographer', 'radiologist'], params: idParamsSchema }, async ({ params }) => ({
  attachments: await listAttachments(params.id),
}));

/** Adds one file (multipart/form-data, field "file"): 201 when stored, 200 with duplicate: true when already there. */
export const POST = endpoint({ roles: ['admin', 'sonographer'], params: idParamsSchema }, async ({ user, params, requestId, context }) => {
  const file = await readUploadedFile(context.request);
  const answer = await uploadAttachment(user, params.id, file, requestId);
  return json(answer, answer.duplicate ? 200 : 201);
});
