import { hoursSettingsSchema } from '../../../../lib/schemas/settings';
import { endpoint } from '../../../../server/http/endpoint';
import { saveHoursSettings } from '../../../../server/services/settings-admin';

/** Opening hours per weekday and closed dates; booked exams stay where they are. */
export const PUT = endpoint({ roles: ['admin'], body: hoursSettingsSchema }, async ({ user, body, requestId }) => saveHoursSettings(user, body, requestId));
