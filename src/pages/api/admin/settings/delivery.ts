import { deliverySettingsSchema } from '../../../../lib/schemas/settings';
import { endpoint } from '../../../../server/http/endpoint';
import { saveDeliverySettings } from '../../../../server/services/settings-admin';

/** Report e-mails to referrers: link lifetime and the PDF attachment. */
export const PUT = endpoint({ roles: ['admin'], body: deliverySettingsSchema }, async ({ user, body, requestId }) => saveDeliverySettings(user, body, requestId));
