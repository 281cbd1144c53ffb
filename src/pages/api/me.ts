import { ALL_SIGNED_IN } from '../../server/auth/roles';
import { endpoint } from '../../server/http/endpoint';

/** The signed-in user, for islands that need name and role. */
export const GET = endpoint({ roles: ALL_SIGNED_IN }, async ({ user }) => ({ user }));
