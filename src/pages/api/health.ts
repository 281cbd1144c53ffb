import { endpoint } from '../../server/http/endpoint';
import { json } from '../../server/http/responses';
import { databaseReachable } from '../../server/services/health';

/** Liveness and database reachability, for the start script, load balancers and monitoring. */
export const GET = endpoint({ roles: 'public' }, async () => {
  const database = (await databaseReachable()) ? 'up' : 'down';
  return json({ status: database === 'up' ? 'ok' : 'degraded', database }, database === 'up' ? 200 : 503);
});
