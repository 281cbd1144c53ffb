import { idParamsSchema, updateUserSchema } from '../../../lib/schemas/users';
import { endpoint } from '../../../server/http/endpoint';
import { updateUser } from '../../../server/services/users';

export const PATCH = endpoint(
  { roles: ['admin'], params: idParamsSchema, body: updateUserSchema },
  async ({ user, params, body, requestId }) => ({ user: await updateUser(user, params.id, body, requestId) }),
);
