import { discardHeldSchema } from '../../../../lib/schemas/holding';
import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { discardHeld } from '../../../../server/services/holding';

/** Deletes a held object and its files, with the reason in the audit trail. */
export const POST = endpoint({ roles: ['frontdesk', 'admin'], params: idParamsSchema, body: discardHeldSchema }, async ({ user, params, body, requestId }) => {
  await discardHeld(user, params.id, body, requestId);
  return { discarded: params.id };
});
