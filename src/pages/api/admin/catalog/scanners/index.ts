import { scannerFieldsSchema } from '../../../../../lib/schemas/catalog-admin';
import { endpoint } from '../../../../../server/http/endpoint';
import { json } from '../../../../../server/http/responses';
import { createScanner, listScanners } from '../../../../../server/services/catalog-admin';

export const GET = endpoint({ roles: ['admin'] }, async () => ({ rows: await listScanners() }));

export const POST = endpoint({ roles: ['admin'], body: scannerFieldsSchema }, async ({ user, body, requestId }) =>
  json({ row: await createScanner(user, body, requestId) }, 201),
);
