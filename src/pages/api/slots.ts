import { slotsQuerySchema } from '../../lib/schemas/exams';
import { endpoint } from '../../server/http/endpoint';
import { suggestSlots } from '../../server/services/slots';

/** The next free starts for an exam type with a room, scanner and sonographer. */
export const GET = endpoint({ roles: ['admin', 'frontdesk'], query: slotsQuerySchema }, async ({ query }) => ({ slots: await suggestSlots(query) }));
