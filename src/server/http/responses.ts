import type { ErrorCode } from './errors';

/** A JSON answer with no caching. */
export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), {
    status,
    headers: { 'Content-Type': 'application/json; charset=utf-8', 'Cache-Control': 'no-store', ...headers },
  });
}

/** The one error shape of every endpoint; `extra` adds members beside code, message and fields. */
export function errorResponse(
  status: number,
  code: ErrorCode,
  message: string,
  fields?: Record<string, string>,
  extra?: Record<string, unknown>,
): Response {
  return json({ error: { ...extra, code, message, ...(fields ? { fields } : {}) } }, status);
}

export const DATABASE_DOWN_MESSAGE =
  'Crestline cannot reach its database right now. Nothing was changed; please try again in a minute, and tell the clinic manager if it keeps happening.';

/** 503 for a database outage, as JSON for the API and as a small page otherwise. */
export function dependencyDownResponse(api: boolean): Response {
  if (api) return errorResponse(503, 'DEPENDENCY_DOWN', DATABASE_DOWN_MESSAGE);
  const html = `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Crestline is unavailable</title>
<meta name="viewport" content="width=device-width,initial-scale=1"></head>
<body style="font-family:system-ui,sans-serif;max-width:36rem;margin:4rem auto;padding:0 1rem;color:#1b2a3a">
<h1 style="font-size:1.4rem">Crestline is briefly unavailable</h1><p>${DATABASE_DOWN_MESSAGE}</p>
<p><a href="">Try again</a></p></body></html>`;
  return new Response(html, {
    status: 503,
    headers: { 'Content-Type': 'text/html; charset=utf-8', 'Retry-After': '30', 'Cache-Control': 'no-store' },
  });
}
