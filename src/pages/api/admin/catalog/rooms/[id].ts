import { activeChangeSchema, catalogIdParamsSchema, updateRoomSchema } from '../../../../../lib/schemas/catalog-admin';
import { endpoint } from '../../../../../server/http/endpoint';
import { deletingRefused, setRoomActive, updateRoom } from '../../../../../server/services/catalog-admin';

/** The whole room with the version it was opened with. */
export const PUT = endpoint({ roles: ['admin'], params: catalogIdParamsSchema, body: updateRoomSchema }, async ({ user, params, body, requestId }) => ({
  row: await updateRoom(user, params.id, body, requestId),
}));

/** Deactivate or reactivate: `{ version, active }`. */
export const PATCH = endpoint({ roles: ['admin'], params: catalogIdParamsSchema, body: activeChangeSchema }, async ({ user, params, body, requestId }) =>
  setRoomActive(user, params.id, body, requestId),
);

export const DELETE = endpoint({ roles: ['admin'] }, async () => {
  throw deletingRefused('room');
});
