import type { APIContext, APIRoute } from 'astro';
import {
  BaseError,
  ConnectionError,
  OptimisticLockError,
  TimeoutError,
  UniqueConstraintError,
  ForeignKeyConstraintError,
} from 'sequelize';
import type { z } from 'zod';
import { roleAllowed, type Role } from '../../lib/roles';
import type { SessionUser } from '../../lib/session-user';
import { log } from '../log';
import { HttpError } from './errors';
import { DATABASE_DOWN_MESSAGE, errorResponse, json } from './responses';
import { fieldErrors } from '../../lib/field-errors';

type Schema = z.ZodType;
type Out<S> = S extends z.ZodType ? z.output<S> : undefined;

export interface EndpointSpec<P, Q, B> {
  /** Who may call it; checked on the server before anything else. */
  roles: readonly Role[] | 'public';
  params?: P;
  query?: Q;
  body?: B;
  /** Largest accepted JSON body in bytes (default 64 KiB). */
  maxBodyBytes?: number;
}

export interface HandlerContext<P, Q, B, Public extends boolean> {
  user: Public extends true ? SessionUser | undefined : SessionUser;
  params: Out<P>;
  query: Out<Q>;
  body: Out<B>;
  requestId: string;
  context: APIContext;
}

/** An APIRoute that also tells the route-matrix test which roles it allows. */
export type GuardedRoute = APIRoute & { roles: readonly Role[] | 'public' };

/**
 * Wraps an endpoint handler: role check (401/403), zod validation of params, query and JSON
 * body (400 with field errors), and mapping of failures to the one error shape. The handler
 * returns plain data (sent as 200 JSON) or its own Response.
 *
 * @example export const GET = endpoint({ roles: ['admin'] }, async () => ({ ok: true }));
 */
export function endpoint<
  P extends Schema | undefined = undefined,
  Q extends Schema | undefined = undefined,
  B extends Schema | undefined = undefined,
  R extends readonly Role[] | 'public' = readonly Role[],
>(
  spec: EndpointSpec<P, Q, B> & { roles: R },
  handler: (ctx: HandlerContext<P, Q, B, R extends 'public' ? true : false>) => Promise<unknown>,
): GuardedRoute {
  const route = async (context: APIContext): Promise<Response> => {
    const { locals } = context;
    const user = locals.user;
    if (spec.roles !== 'public') {
      if (!user) return errorResponse(401, 'UNAUTHENTICATED', 'Please sign in to continue.');
      if (!roleAllowed(user.role, spec.roles)) {
        return errorResponse(403, 'FORBIDDEN', 'Your role does not allow this action.');
      }
    }
    try {
      const params = parsePart(spec.params, context.params, 'params');
      const query = parsePart(spec.query, Object.fromEntries(context.url.searchParams), 'query');
      const body = spec.body ? parsePart(spec.body, await readJson(context.request, spec.maxBodyBytes), 'body') : undefined;
      const result = await handler({
        user: user as SessionUser,
        params: params as Out<P>,
        query: query as Out<Q>,
        body: body as Out<B>,
        requestId: locals.requestId,
        context,
      });
      if (result instanceof Response) return result;
      return json(result ?? { ok: true });
    } catch (error) {
      return toErrorResponse(error, locals.requestId, context.routePattern);
    }
  };
  return Object.assign(route, { roles: spec.roles });
}

function parsePart(schema: Schema | undefined, value: unknown, part: string): unknown {
  if (!schema) return undefined;
  const parsed = schema.safeParse(value);
  if (parsed.success) return parsed.data;
  const fields = fieldErrors(parsed.error);
  const where = part === 'body' ? '' : ` in the ${part === 'params' ? 'address' : 'query'}`;
  throw new HttpError(400, 'VALIDATION', `Some values${where} need correcting.`, fields);
}

async function readJson(request: Request, maxBytes = 64 * 1024): Promise<unknown> {
  const type = request.headers.get('content-type') ?? '';
  if (!type.includes('application/json')) {
    throw new HttpError(415, 'UNSUPPORTED_MEDIA_TYPE', 'Send the request body as JSON (Content-Type: application/json).');
  }
  const declared = Number(request.headers.get('content-length') ?? 0);
  if (declared > maxBytes) throw new HttpError(413, 'PAYLOAD_TOO_LARGE', 'The request body is too large.');
  const text = await request.text();
  if (text.length > maxBytes) throw new HttpError(413, 'PAYLOAD_TOO_LARGE', 'The request body is too large.');
  try {
    return JSON.parse(text);
  } catch {
    throw new HttpError(400, 'BAD_JSON', 'The request body is not valid JSON.');
  }
}

function toErrorResponse(error: unknown, requestId: string, route: string): Response {
  if (error instanceof HttpError) {
    return errorResponse(error.status, error.code, error.message, error.fields, error.extra);
  }
  if (error instanceof OptimisticLockError) {
    return errorResponse(409, 'STALE', 'Someone else saved a newer version first. Reload to see it, then try again.');
  }
  if (error instanceof UniqueConstraintError) {
    const fields = Object.fromEntries(
      error.errors.map((e) => [e.path ?? 'value', 'This value is already in use.']),
    );
    return errorResponse(409, 'CONFLICT', 'That value is already in use.', fields);
  }
  if (error instanceof ForeignKeyConstraintError) {
    return errorResponse(409, 'CONFLICT', 'This record is linked to others and cannot be changed that way.');
  }
  const errno = (error as { parent?: { errno?: number } })?.parent?.errno;
  if (errno === 1213 || errno === 1205) {
    // Deadlock or lock wait time-out: another change to the same records won the race.
    return errorResponse(409, 'CONFLICT', 'Someone else was changing the same records at that moment. Nothing was saved; please try again.');
  }
  if (error instanceof ConnectionError || error instanceof TimeoutError) {
    log.error({ requestId, route, err: { name: error.name } }, 'database unavailable');
    return errorResponse(503, 'DEPENDENCY_DOWN', DATABASE_DOWN_MESSAGE);
  }
  // Unknown failure: log the class and where it came from, never the message (it may hold
  // submitted values) nor the stack; answer with the request id so staff can quote it.
  const err = error as Error;
  const at = err?.stack?.split('\n')[1]?.trim().slice(0, 200);
  log.error({ requestId, route, err: { name: err?.name, sql: error instanceof BaseError, at } }, 'unhandled error');
  return errorResponse(500, 'INTERNAL', `Something went wrong on our side. Nothing was saved. Reference: ${requestId}`);
}
