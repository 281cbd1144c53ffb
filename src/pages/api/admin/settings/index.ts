import { endpoint } from '../../../../server/http/endpoint';
import { settingsForEditing } from '../../../../server/services/settings-admin';

/** Every group of the clinic settings form, each with the version a save sends back. */
export const GET = endpoint({ roles: ['admin'] }, async () => ({ settings: await settingsForEditing() }));
