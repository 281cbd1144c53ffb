import { clinicSettingsSchema } from '../../../../lib/schemas/settings';
import { endpoint } from '../../../../server/http/endpoint';
import { saveClinicSettings } from '../../../../server/services/settings-admin';

/** The clinic profile: name, address, contact and time zone (409 when someone saved meanwhile). */
export const PUT = endpoint({ roles: ['admin'], body: clinicSettingsSchema }, async ({ user, body, requestId }) => saveClinicSettings(user, body, requestId));
