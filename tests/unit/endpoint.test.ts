import type { APIContext } from 'astro';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { ConnectionRefusedError, OptimisticLockError } from 'sequelize';
import { endpoint } from '../../src/server/http/endpoint';
import { HttpError } from '../../src/server/http/errors';
import type { SessionUser } from '../../src/lib/session-user';

const desk: SessionUser = { id: 7, email: 'd@x.test', displayName: 'D', role: 'frontdesk', referrerId: null };

function ctx(opts: { user?: SessionUser; body?: string; contentType?: string; params?: Record<string, string>; search?: string } = {}): APIContext {
  const url = new URL(`http://127.0.0.1/api/thing${opts.search ?? ''}`);
  const request = new Request(url, {
    method: opts.body !== undefined ? 'POST' : 'GET',
    headers: opts.body !== undefined ? { 'content-type': opts.contentType ?? 'application/json' } : {},
    body: opts.body,
  });
  return { request, url, params: opts.params ?? {}, locals: { user: opts.user, requestId: 'req-1' }, routePattern: '/api/thing' } as unknown as APIContext;
}

async function read(res: Response) {
  return { status: res.status, body: (await res.json()) as any };
}

describe('endpoint()', () => {
  const route = endpoint(
    { roles: ['frontdesk'], body: z.object({ n: z.number().int().min(1) }) },
    async ({ body, user }) => ({ doubled: body.n * 2, by: user.id }),
  );

  it('carries its roles for the route-matrix test', () => {
    expect(route.roles).toEqual(['frontdesk']);
  });
  it('401 without a user, 403 for another role, before reading the body', async () => {
    expect(await read(await route(ctx({ body: '{' })))).toMatchObject({ status: 401, body: { error: { code: 'UNAUTHENTICATED' } } });
    expect(await read(await route(ctx({ user: { ...desk, role: 'sonographer' }, body: '{' })))).toMatchObject({ status: 403 });
  });
  it('400 with field errors for a bad body, BAD_JSON for broken JSON', async () => {
    expect(await read(await route(ctx({ user: desk, body: '{"n":0}' })))).toMatchObject({ status: 400, body: { error: { code: 'VALIDATION', fields: { n: expect.any(String) } } } });
    expect(await read(await route(ctx({ user: desk, body: '{"n":' })))).toMatchObject({ status: 400, body: { error: { code: 'BAD_JSON' } } });
  });
  it('runs the handler with parsed input', async () => {
    expect(await read(await route(ctx({ user: desk, body: '{"n":21}' })))).toEqual({ status: 200, body: { doubled: 42, by: 7 } });
  });
  it('maps failures to the one error shape without leaking their text', async () => {
    const failing = (error: unknown) => endpoint({ roles: 'public' }, async () => { throw error; });
    expect(await read(await failing(new HttpError(409, 'CONFLICT', 'Room 2 is booked'))(ctx()))).toEqual({ status: 409, body: { error: { code: 'CONFLICT', message: 'Room 2 is booked' } } });
    expect((await read(await failing(new OptimisticLockError({ message: 'x' }))(ctx()))).status).toBe(409);
    const down = await read(await failing(new ConnectionRefusedError(new Error('ECONNREFUSED 127.0.0.1:3317')))(ctx()));
    expect(down.status).toBe(503);
    expect(down.body.error.message).not.toContain('3317');
    const boom = await read(await failing(new Error('secret patient Jane Roe'))(ctx()));
    expect(boom.status).toBe(500);
    expect(JSON.stringify(boom.body)).not.toContain('Jane');
    expect(boom.body.error.message).toContain('req-1');
  });
  it('validates query strings too', async () => {
    const list = endpoint({ roles: 'public', query: z.object({ page: z.coerce.number().int().min(1) }) }, async ({ query }) => query);
    expect(await read(await list(ctx({ search: '?page=3' })))).toEqual({ status: 200, body: { page: 3 } });
    expect((await read(await list(ctx({ search: '?page=zero' })))).status).toBe(400);
  });
});
