import { attachHeldSchema } from '../../../../lib/schemas/holding';
import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { attachHeld } from '../../../../server/services/holding';

/** Files a held object with an exam; 409 IDENTITY_MISMATCH until a mismatch is confirmed. */
export const POST = endpoint({ roles: ['frontdesk', 'admin'], params: idParamsSchema, body: attachHeldSchema }, async ({ user, params, body, requestId }) => ({
  attached: await attachHeld(user, params.id, body, requestId),
}));
