import { ALL_SIGNED_IN } from '../../server/auth/roles';
import { endpoint } from '../../server/http/endpoint';

/**
 * The cheapest signed-in answer: session check and nothing else. The benchmark compares the
 * worklist with it, and monitoring can use it to check sign-in end to end.
 */
export const GET = endpoint({ roles: ALL_SIGNED_IN }, async () => ({ ok: true }));
