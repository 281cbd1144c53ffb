import { activeChangeSchema, catalogIdParamsSchema, updateProbeSchema } from '../../../../../lib/schemas/catalog-admin';
import { endpoint } from '../../../../../server/http/endpoint';
import { deletingRefused, setProbeActive, updateProbe } from '../../../../../server/services/catalog-admin';

/** The whole probe with the version it was opened with. */
export const PUT = endpoint({ roles: ['admin'], params: catalogIdParamsSchema, body: updateProbeSchema }, async ({ user, params, body, requestId }) => ({
  row: await updateProbe(user, params.id, body, requestId),
}));

/** Out of service (`active: false`, today is its last day) or back in service (`active: true`). */
export const PATCH = endpoint({ roles: ['admin'], params: catalogIdParamsSchema, body: activeChangeSchema }, async ({ user, params, body, requestId }) =>
  setProbeActive(user, params.id, body, requestId),
);

export const DELETE = endpoint({ roles: ['admin'] }, async () => {
  throw deletingRefused('probe');
});
