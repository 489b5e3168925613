import { z } from 'zod';
import { ROLES, type Role } from './roles';

export type { Role };

/** Minimum password length; a memory-hard hash protects the rest. */
export const PASSWORD_MIN_LENGTH = 10;

const email = z.string().trim().toLowerCase().pipe(z.email({ message: 'Enter a valid e-mail address' })).pipe(z.string().max(254));
const password = z
  .string()
  .min(PASSWORD_MIN_LENGTH, { message: `Use at least ${PASSWORD_MIN_LENGTH} characters` })
  .max(200, { message: 'Use at most 200 characters' });

/** POST /api/auth/sign-in */
export const signInSchema = z.object({
  email,
  password: z.string().min(1, { message: 'Enter your password' }).max(200),
});
export type SignInInput = z.infer<typeof signInSchema>;

/** POST /api/auth/sign-up: self-registration always creates a proposer. */
export const signUpSchema = z.object({
  email,
  password,
  displayName: z.string().trim().min(1, { message: 'Enter your name' }).max(120),
  affiliation: z.string().trim().max(200).default(''),
});
export type SignUpInput = z.input<typeof signUpSchema>;

/** POST /api/auth/password-reset: always answers 202 so that it does not reveal which e-mails exist. */
export const passwordResetRequestSchema = z.object({ email });
export type PasswordResetRequestInput = z.infer<typeof passwordResetRequestSchema>;

/** POST /api/auth/password-reset/confirm */
export const passwordResetConfirmSchema = z.object({
  token: z.string().min(20, { message: 'The reset link is incomplete' }).max(200),
  password,
});
export type PasswordResetConfirmInput = z.infer<typeof passwordResetConfirmSchema>;

/** PATCH /api/admin/accounts/:id */
export const updateAccountSchema = z
  .object({
    roles: z.array(z.enum(ROLES)).max(ROLES.length).optional(),
    disabled: z.boolean().optional(),
  })
  .refine((v) => v.roles !== undefined || v.disabled !== undefined, { message: 'Nothing to change' });
export type UpdateAccountInput = z.infer<typeof updateAccountSchema>;

/** The signed-in person, as the client sees it (GET /api/auth/session → `{ user }`). */
export interface SessionUser {
  id: number;
  email: string;
  displayName: string;
  affiliation: string;
  roles: Role[];
}

/** One row of the administrator's account table (GET /api/admin/accounts). */
export interface AccountSummary extends SessionUser {
  disabled: boolean;
  createdAt: string;
  lastSignInAt: string | null;
}

/** GET /api/admin/accounts query string. */
export const listAccountsQuerySchema = z.object({
  search: z.string().trim().max(200).optional(),
  role: z.enum(ROLES).optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
});
export type ListAccountsQuery = z.infer<typeof listAccountsQuerySchema>;

export interface AccountPage {
  items: AccountSummary[];
  total: number;
}
