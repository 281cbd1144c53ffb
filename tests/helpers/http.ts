import { testEnv } from './env';
import { DEMO_LOGIN, DEMO_PASSWORD } from './demo';
import type { Role } from '../../src/lib/roles';

/** Cookies from Set-Cookie headers, as one Cookie header value. */
function cookieHeader(res: Response, jar: Map<string, string>): string {
  for (const line of res.headers.getSetCookie()) {
    const [pair] = line.split(';');
    const i = pair!.indexOf('=');
    const name = pair!.slice(0, i).trim();
    const value = pair!.slice(i + 1).trim();
    if (value === '' || /max-age=0|expires=thu, 01 jan 1970/i.test(line)) jar.delete(name);
    else jar.set(name, value);
  }
  return [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
}

export interface SignInOutcome {
  cookie: string | undefined;
  code: string | null;
}

/** Signs in through Auth.js over HTTP, as the browser does; returns the session cookie. */
export async function signIn(email: string, password: string): Promise<SignInOutcome> {
  const { baseUrl } = testEnv();
  const jar = new Map<string, string>();
  const csrfRes = await fetch(`${baseUrl}/api/auth/csrf`);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  let cookies = cookieHeader(csrfRes, jar);
  const res = await fetch(`${baseUrl}/api/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded', 'X-Auth-Return-Redirect': '1', Cookie: cookies, Origin: baseUrl },
    body: new URLSearchParams({ email, password, csrfToken, callbackUrl: '/' }),
  });
  cookies = cookieHeader(res, jar);
  const body = (await res.json()) as { url: string };
  const code = new URL(body.url, baseUrl).searchParams.get('code');
  const session = [...jar.keys()].find((k) => k.endsWith('authjs.session-token'));
  return { cookie: session ? `${session}=${jar.get(session)}` : undefined, code };
}

const sessions = new Map<Role, string>();

/** A session cookie for the demo account of a role (cached per test file). */
export async function sessionFor(role: Role): Promise<string> {
  const cached = sessions.get(role);
  if (cached) return cached;
  const { cookie, code } = await signIn(DEMO_LOGIN[role], DEMO_PASSWORD);
  if (!cookie) throw new Error(`demo ${role} could not sign in (${code})`);
  sessions.set(role, cookie);
  return cookie;
}

/** A request to the app with an optional session cookie and JSON body. */
export async function call(
  method: string,
  path: string,
  opts: { cookie?: string; json?: unknown; rawBody?: string; headers?: Record<string, string> } = {},
): Promise<{ status: number; body: any; headers: Headers }> {
  const { baseUrl } = testEnv();
  const headers: Record<string, string> = { Origin: baseUrl, ...opts.headers };
  if (opts.cookie) headers.Cookie = opts.cookie;
  let body: string | undefined;
  if (opts.json !== undefined) {
    headers['Content-Type'] = 'application/json';
    body = JSON.stringify(opts.json);
  } else if (opts.rawBody !== undefined) {
    headers['Content-Type'] ??= 'application/json';
    body = opts.rawBody;
  }
  const res = await fetch(`${baseUrl}${path}`, { method, headers, body, redirect: 'manual' });
  const text = await res.text();
  let parsed: unknown = text;
  try {
    parsed = JSON.parse(text);
  } catch {
    // pages answer HTML
  }
  return { status: res.status, body: parsed, headers: res.headers };
}
