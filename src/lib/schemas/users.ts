import { z } from 'zod';
import { ROLES } from '../roles';

const password = z
  .string()
  .min(12, 'Use at least 12 characters.')
  .max(200, 'Use at most 200 characters.');

/** New staff account, created by the clinic manager with a first password to hand over. */
export const createUserSchema = z
  .object({
    email: z.string().trim().toLowerCase().email('Enter a valid e-mail address.').max(254),
    displayName: z.string().trim().min(2, 'Enter the full name.').max(120),
    role: z.enum(ROLES, { message: 'Choose a role.' }),
    password,
    referrerId: z.coerce.number().int().positive().nullable().optional(),
  })
  .superRefine((v, ctx) => {
    if (v.role === 'referrer' && !v.referrerId) {
      ctx.addIssue({ code: 'custom', path: ['referrerId'], message: 'A referring clinician account must be linked to a directory entry.' });
    }
  });
export type CreateUserInput = z.infer<typeof createUserSchema>;

/** A change to an account; `version` is the one the manager saw, for stale-edit detection. */
export const updateUserSchema = z
  .object({
    version: z.number().int().min(0),
    role: z.enum(ROLES).optional(),
    active: z.boolean().optional(),
    unlock: z.literal(true).optional(),
    password: password.optional(),
    referrerId: z.number().int().positive().nullable().optional(),
  })
  .refine((v) => Object.keys(v).some((k) => k !== 'version'), { message: 'Nothing to change.' });
export type UpdateUserInput = z.infer<typeof updateUserSchema>;

export const userListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
  sort: z.enum(['displayName', 'email', 'role', 'lastSignInAt', 'createdAt']).default('displayName'),
  dir: z.enum(['asc', 'desc']).default('asc'),
  q: z.string().trim().max(100).optional(),
  role: z.enum(ROLES).optional(),
});
export type UserListQuery = z.infer<typeof userListQuerySchema>;

export const idParamsSchema = z.object({ id: z.coerce.number().int().positive('Not a valid id.') });

export const changePasswordSchema = z
  .object({
    currentPassword: z.string().min(1, 'Enter your current password.').max(200),
    newPassword: password,
    confirmPassword: z.string(),
  })
  .refine((v) => v.newPassword === v.confirmPassword, { path: ['confirmPassword'], message: 'The two new passwords differ.' })
  .refine((v) => v.newPassword !== v.currentPassword, { path: ['newPassword'], message: 'Choose a password different from the current one.' });
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>;

/** An account as the manager's list shows it. */
export interface UserRow {
  id: number;
  email: string;
  displayName: string;
  role: (typeof ROLES)[number];
  active: boolean;
  locked: boolean;
  lastSignInAt: string | null;
  referrerId: number | null;
  referrerName: string | null;
  version: number;
}
