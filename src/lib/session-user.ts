import type { Role } from './roles';

/** The signed-in user as pages, endpoints and islands see it. */
export interface SessionUser {
  id: number;
  email: string;
  displayName: string;
  role: Role;
  referrerId: number | null;
}
