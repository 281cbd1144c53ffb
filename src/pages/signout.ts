import type { APIRoute } from 'astro';
import { recordSignOut } from '../server/services/sign-in';

// Sign-out ends the session cookie. Astro's origin check guards this POST against CSRF.
export const POST: APIRoute = async ({ cookies, locals, redirect }) => {
  if (locals.user) await recordSignOut(locals.user.id);
  for (const name of ['authjs.session-token', '__Secure-authjs.session-token']) {
    cookies.delete(name, { path: '/' });
  }
  return redirect('/signin?signedout=1', 303);
};
