import { roomFieldsSchema } from '../../../../../lib/schemas/catalog-admin';
import { endpoint } from '../../../../../server/http/endpoint';
import { json } from '../../../../../server/http/responses';
import { createRoom, listRooms } from '../../../../../server/services/catalog-admin';

export const GET = endpoint({ roles: ['admin'] }, async () => ({ rows: await listRooms() }));

export const POST = endpoint({ roles: ['admin'], body: roomFieldsSchema }, async ({ user, body, requestId }) =>
  json({ row: await createRoom(user, body, requestId) }, 201),
);
