import { readingSchema } from '../../../../lib/schemas/reports';
import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { saveReading } from '../../../../server/services/reading';

/** The reading physician's findings and impression, sanitized by the server before they are stored. */
export const PUT = endpoint({ roles: ['radiologist'], params: idParamsSchema, body: readingSchema, maxBodyBytes: 128 * 1024 }, async ({ user, params, body, requestId }) => ({
  report: await saveReading(user, params.id, body, requestId),
}));
