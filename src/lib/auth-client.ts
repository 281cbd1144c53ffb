/**
 * Browser side of credentials sign-in through Auth.js: fetch a CSRF token, post the form,
 * and read the refusal code (if any) from the redirect URL Auth.js answers with.
 */
export async function signInWithPassword(
  email: string,
  password: string,
): Promise<{ ok: true } | { ok: false; code: string }> {
  try {
    const csrf = await fetch('/api/auth/csrf', { credentials: 'same-origin' });
    if (!csrf.ok) return { ok: false, code: 'unavailable' };
    const { csrfToken } = (await csrf.json()) as { csrfToken: string };
    const res = await fetch('/api/auth/callback/credentials', {
      method: 'POST',
      credentials: 'same-origin',
      headers: { 'Content-Type': 'application/x-www-form-urlencoded', 'X-Auth-Return-Redirect': '1' },
      body: new URLSearchParams({ email, password, csrfToken, callbackUrl: '/' }),
    });
    if (!res.ok) return { ok: false, code: 'unavailable' };
    const { url } = (await res.json()) as { url: string };
    const params = new URL(url, window.location.origin).searchParams;
    if (params.get('error')) {
      const code = params.get('code');
      return { ok: false, code: code && code !== 'credentials' ? code : params.get('error') === 'CredentialsSignin' ? 'invalid' : 'unavailable' };
    }
    return { ok: true };
  } catch {
    return { ok: false, code: 'unavailable' };
  }
}
