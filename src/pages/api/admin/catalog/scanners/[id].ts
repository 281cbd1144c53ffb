import { activeChangeSchema, catalogIdParamsSchema, updateScannerSchema } from '../../../../../lib/schemas/catalog-admin';
import { endpoint } from '../../../../../server/http/endpoint';
import { deletingRefused, setScannerActive, updateScanner } from '../../../../../server/services/catalog-admin';

/** The whole scanner with the version it was opened with. */
export const PUT = endpoint({ roles: ['admin'], params: catalogIdParamsSchema, body: updateScannerSchema }, async ({ user, params, body, requestId }) => ({
  row: await updateScanner(user, params.id, body, requestId),
}));

/** Deactivate or reactivate: `{ version, active }`; the answer says how many booked exams still name the scanner. */
export const PATCH = endpoint({ roles: ['admin'], params: catalogIdParamsSchema, body: activeChangeSchema }, async ({ user, params, body, requestId }) =>
  setScannerActive(user, params.id, body, requestId),
);

export const DELETE = endpoint({ roles: ['admin'] }, async () => {
  throw deletingRefused('scanner');
});
