import { examTypeFieldsSchema } from '../../../../../lib/schemas/catalog-admin';
import { endpoint } from '../../../../../server/http/endpoint';
import { json } from '../../../../../server/http/responses';
import { createExamType, listExamTypes } from '../../../../../server/services/catalog-admin';

export const GET = endpoint({ roles: ['admin'] }, async () => ({ rows: await listExamTypes() }));

export const POST = endpoint({ roles: ['admin'], body: examTypeFieldsSchema }, async ({ user, body, requestId }) =>
  json({ row: await createExamType(user, body, requestId) }, 201),
);
