import { cancellationSettingsSchema } from '../../../../lib/schemas/settings';
import { endpoint } from '../../../../server/http/endpoint';
import { saveCancellationSettings } from '../../../../server/services/settings-admin';

/** The full-refund window for cancellations. */
export const PUT = endpoint({ roles: ['admin'], body: cancellationSettingsSchema }, async ({ user, body, requestId }) => saveCancellationSettings(user, body, requestId));
