// The web server (scripts/serve.mjs) in front of the built app: the build's client files from
// its start-up list with their caching headers, everything else to Astro.
import { describe, expect, it } from 'vitest';
import { testEnv } from '../helpers/env';

const get = (path: string, headers: Record<string, string> = {}, method = 'GET') => fetch(testEnv().baseUrl + path, { method, headers, redirect: 'manual' });

/** The first hashed asset the sign-in page loads (a stylesheet or a script under /_astro/). */
async function anAsset(): Promise<string> {
  const html = await (await get('/signin')).text();
  const found = html.match(/(?:href|src)="(\/_astro\/[^"]+\.(?:css|js))"/);
  expect(found, 'the sign-in page links a built asset').not.toBeNull();
  return found![1]!;
}

describe('web server', () => {
  it('serves a built asset with its type, length, and a year of immutable caching', async () => {
    const asset = await anAsset();
    const res = await get(asset);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(asset.endsWith('.css') ? /^text\/css/ : /^text\/javascript/);
    expect(res.headers.get('cache-control')).toBe('public, max-age=31536000, immutable');
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    const body = await res.arrayBuffer();
    expect(Number(res.headers.get('content-length'))).toBe(body.byteLength);
    expect(body.byteLength).toBeGreaterThan(100);
  });

  it('answers a conditional request for an unchanged file with 304 and no body', async () => {
    const asset = await anAsset();
    const etag = (await get(asset)).headers.get('etag');
    expect(etag).toMatch(/^"[0-9a-f]+-[0-9a-f]+"$/);
    const again = await get(asset, { 'if-none-match': etag! });
    expect(again.status).toBe(304);
    expect((await again.arrayBuffer()).byteLength).toBe(0);
  });

  it('serves files of public/ (the favicon) with a short cache, and HEAD without a body', async () => {
    const res = await get('/favicon.svg');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('image/svg+xml');
    expect(res.headers.get('cache-control')).toBe('public, max-age=3600');
    expect(await res.text()).toContain('<svg');
    const head = await get('/favicon.svg', {}, 'HEAD');
    expect(head.status).toBe(200);
    expect(head.headers.get('content-length')).toBe(res.headers.get('content-length'));
  });

  it('never reaches outside the build: an unknown or climbing path is the app’s 404, and a malformed one is 400', async () => {
    for (const path of ['/_astro/nothing-here.js', '/_astro/..%2f..%2fserver%2fentry.mjs', '/..%2f..%2fpackage.json']) {
      const res = await get(path);
      expect(res.status, path).toBe(404);
      expect(await res.text(), path).not.toContain('"dependencies"');
    }
    const bad = await get('/%E0%A4%A');
    expect(bad.status).toBe(400);
  });

  it('sends a POST to a file’s path to the app, not the file', async () => {
    const res = await get('/favicon.svg', { origin: testEnv().baseUrl }, 'POST');
    expect(res.headers.get('content-type') ?? '').not.toBe('image/svg+xml');
    expect(res.headers.get('x-request-id')).toMatch(/[0-9a-f-]{36}/);
  });

  it('still hands pages and endpoints to the app with its headers', async () => {
    const res = await get('/api/health');
    expect(res.status).toBe(200);
    expect(res.headers.get('cache-control')).toBe('no-store');
    expect(res.headers.get('x-request-id')).toMatch(/[0-9a-f-]{36}/);
    const page = await get('/signin');
    expect(page.status).toBe(200);
    expect(page.headers.get('content-type')).toMatch(/^text\/html/);
  });
});
