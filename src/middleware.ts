import { defineMiddleware } from 'astro:middleware';
import { loadSessionUser, sessionUserId } from './server/auth/session';
import { log } from './server/log';
import { dependencyDownResponse } from './server/http/responses';

/**
 * Loads the signed-in user into `locals` and adds request-wide headers. It authorizes
 * nothing: each page and endpoint states its roles (requirePageRole / endpoint()).
 */
export const onRequest = defineMiddleware(async (context, next) => {
  const started = performance.now();
  const requestId = context.request.headers.get('x-request-id')?.slice(0, 64) || crypto.randomUUID();
  context.locals.requestId = requestId;

  const isAsset = context.url.pathname.startsWith('/_astro/');
  if (!isAsset) {
    try {
      const userId = await sessionUserId(context.cookies);
      if (userId !== undefined) context.locals.user = await loadSessionUser(userId);
    } catch (error) {
      log.error({ requestId, err: { name: (error as Error).name } }, 'session lookup failed');
      return dependencyDownResponse(context.url.pathname.startsWith('/api/'));
    }
  }

  const response = await next();
  if (!isAsset) {
    response.headers.set('X-Request-Id', requestId);
    response.headers.set('X-Content-Type-Options', 'nosniff');
    response.headers.set('X-Frame-Options', 'DENY');
    response.headers.set('Referrer-Policy', 'same-origin');
    // Pages and answers carry patient data: never keep them in a shared or browser cache.
    if (!response.headers.has('Cache-Control')) response.headers.set('Cache-Control', 'no-store');
    log.info(
      {
        requestId,
        method: context.request.method,
        route: context.routePattern,
        status: response.status,
        ms: Math.round(performance.now() - started),
        userId: context.locals.user?.id,
      },
      'request',
    );
  }
  return response;
});
