import { bookExamSchema } from '../../../lib/schemas/exams';
import { endpoint } from '../../../server/http/endpoint';
import { json } from '../../../server/http/responses';
import { bookExam } from '../../../server/services/booking';

/** Books an exam (clash-checked, in one transaction). */
export const POST = endpoint({ roles: ['admin', 'frontdesk'], body: bookExamSchema }, async ({ user, body, requestId }) =>
  json({ exam: await bookExam(user, body, requestId) }, 201),
);
