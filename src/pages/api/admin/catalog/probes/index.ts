import { probeFieldsSchema } from '../../../../../lib/schemas/catalog-admin';
import { endpoint } from '../../../../../server/http/endpoint';
import { json } from '../../../../../server/http/responses';
import { createProbe, listProbes } from '../../../../../server/services/catalog-admin';

export const GET = endpoint({ roles: ['admin'] }, async () => ({ rows: await listProbes() }));

export const POST = endpoint({ roles: ['admin'], body: probeFieldsSchema }, async ({ user, body, requestId }) =>
  json({ row: await createProbe(user, body, requestId) }, 201),
);
