import { activeChangeSchema, catalogIdParamsSchema, updateExamTypeSchema } from '../../../../../lib/schemas/catalog-admin';
import { endpoint } from '../../../../../server/http/endpoint';
import { deletingRefused, setExamTypeActive, updateExamType } from '../../../../../server/services/catalog-admin';

/** The whole exam type with the version it was opened with. */
export const PUT = endpoint({ roles: ['admin'], params: catalogIdParamsSchema, body: updateExamTypeSchema }, async ({ user, params, body, requestId }) => ({
  row: await updateExamType(user, params.id, body, requestId),
}));

/** Deactivate or reactivate: `{ version, active }`. */
export const PATCH = endpoint({ roles: ['admin'], params: catalogIdParamsSchema, body: activeChangeSchema }, async ({ user, params, body, requestId }) =>
  setExamTypeActive(user, params.id, body, requestId),
);

export const DELETE = endpoint({ roles: ['admin'] }, async () => {
  throw deletingRefused('exam-type');
});
