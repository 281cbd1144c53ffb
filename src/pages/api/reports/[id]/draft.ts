import { saveDraftSchema } from '../../../../lib/schemas/reports';
import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { saveDraft } from '../../../../server/services/reports';

/** Autosave of the sonographer's entries (a draft) or the reading physician's corrections (a preliminary report); the server recomputes and stores the evaluation. */
export const PUT = endpoint({ roles: ['sonographer', 'radiologist'], params: idParamsSchema, body: saveDraftSchema, maxBodyBytes: 128 * 1024 }, async ({ user, params, body, requestId }) => ({
  report: await saveDraft(user, params.id, body, requestId),
}));
