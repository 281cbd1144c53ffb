import { z } from 'zod';

/** The sign-in form, shared by the island and the credentials check. */
export const signInSchema = z.object({
  email: z.string().trim().min(1, 'Enter your e-mail address.').email('Enter a valid e-mail address.').max(254),
  password: z.string().min(1, 'Enter your password.').max(200),
});
export type SignInInput = z.infer<typeof signInSchema>;

/** What the sign-in page says for each refusal code carried back by Auth.js. */
export const SIGN_IN_MESSAGES: Record<string, string> = {
  invalid: 'That e-mail and password do not match. After 5 wrong attempts in a row the account locks for 15 minutes.',
  locked: 'This account is locked for 15 minutes after 5 wrong passwords. Try again later, or ask the clinic manager to unlock it.',
  deactivated: 'This account has been deactivated. Ask the clinic manager if you need access again.',
  unavailable: 'Crestline cannot check your sign-in right now. Please try again in a minute.',
};

/** Only same-site paths are allowed as the page to return to after sign-in. */
export function safeNextPath(next: string | null | undefined): string {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return '/';
  return next;
}
