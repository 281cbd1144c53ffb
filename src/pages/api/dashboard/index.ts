import { dashboardPeriodSchema } from '../../../lib/schemas/dashboard';
import { endpoint } from '../../../server/http/endpoint';
import { clinicDashboard } from '../../../server/services/dashboard';

/** The clinic dashboard for a period of clinic days: cards and every table. */
export const GET = endpoint({ roles: ['admin'], query: dashboardPeriodSchema }, async ({ query }) => clinicDashboard(query));
