import { changePasswordSchema } from '../../../lib/schemas/users';
import { ALL_SIGNED_IN } from '../../../server/auth/roles';
import { endpoint } from '../../../server/http/endpoint';
import { changeOwnPassword } from '../../../server/services/users';

export const POST = endpoint({ roles: ALL_SIGNED_IN, body: changePasswordSchema }, async ({ user, body, requestId }) => {
  await changeOwnPassword(user, body, requestId);
  return { ok: true };
});
