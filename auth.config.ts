import Credentials from '@auth/core/providers/credentials';
import { CredentialsSignin } from '@auth/core/errors';
import { defineConfig } from 'auth-astro';
import { z } from 'zod';
import { checkCredentials, recordSignOut } from './src/server/services/sign-in';
import { log } from './src/server/log';

const credentialsSchema = z.object({
  email: z.string().trim().email().max(254),
  password: z.string().min(1).max(200),
});

/** Carries our reason ('invalid' | 'locked' | 'deactivated') to the sign-in page as `?code=`. */
class SignInRefused extends CredentialsSignin {
  constructor(code: string) {
    super();
    this.code = code;
  }
}

const maxAgeHours = Number(process.env.SESSION_MAX_AGE_HOURS ?? 10);

export default defineConfig({
  // Read at run time, not build time (auth-astro would otherwise bake import.meta.env in).
  secret: process.env.AUTH_SECRET,
  trustHost: true,
  session: { strategy: 'jwt', maxAge: maxAgeHours * 3600 },
  pages: { signIn: '/signin', error: '/signin' },
  providers: [
    Credentials({
      credentials: { email: {}, password: {} },
      async authorize(raw) {
        const parsed = credentialsSchema.safeParse(raw);
        if (!parsed.success) throw new SignInRefused('invalid');
        const result = await checkCredentials(parsed.data.email, parsed.data.password);
        if (!result.ok) throw new SignInRefused(result.reason);
        const { id, email, displayName } = result.user;
        return { id: String(id), email, name: displayName };
      },
    }),
  ],
  callbacks: {
    // The token carries only the user id; role and status are read from the user row on
    // every request (src/middleware.ts), so a role change or deactivation applies at once.
    jwt({ token, user }) {
      if (user?.id) token.sub = user.id;
      return token;
    },
  },
  events: {
    async signOut(message) {
      const sub = 'token' in message ? message.token?.sub : undefined;
      if (sub && /^\d+$/.test(sub)) await recordSignOut(Number(sub));
    },
  },
  logger: {
    // Auth.js logs refused sign-ins as errors with stacks; keep one quiet line instead.
    error(error) {
      const type = (error as { type?: string }).type ?? error.name;
      if (type === 'CredentialsSignin') return;
      log.warn({ type }, 'auth error');
    },
    warn(code) {
      log.debug({ code }, 'auth warning');
    },
    debug() {},
  },
});
