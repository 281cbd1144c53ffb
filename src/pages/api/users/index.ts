import { createUserSchema, userListQuerySchema } from '../../../lib/schemas/users';
import { endpoint } from '../../../server/http/endpoint';
import { json } from '../../../server/http/responses';
import { createUser, listUsers } from '../../../server/services/users';

export const GET = endpoint({ roles: ['admin'], query: userListQuerySchema }, async ({ query }) =>
  listUsers(query),
);

export const POST = endpoint({ roles: ['admin'], body: createUserSchema }, async ({ user, body, requestId }) =>
  json({ user: await createUser(user, body, requestId) }, 201),
);
