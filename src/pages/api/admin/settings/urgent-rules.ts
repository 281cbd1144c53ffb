import { urgentRulesSettingsSchema } from '../../../../lib/schemas/settings';
import { endpoint } from '../../../../server/http/endpoint';
import { saveUrgentRuleSettings } from '../../../../server/services/settings-admin';

/** Urgent-finding prompts on or off per rule. */
export const PUT = endpoint({ roles: ['admin'], body: urgentRulesSettingsSchema }, async ({ user, body, requestId }) => saveUrgentRuleSettings(user, body, requestId));
