import { z } from 'zod';
import { safeText } from '../http/text';
import { ROLES, type Role } from './roles';

export type { Role };

/** Minimum password length; a memory-hard hash protects the rest. */
export const PASSWORD_MIN_LENGTH = 10;

const email = z
  .string()
  .trim()
  .toLowerCase()
  .pipe(z.email({ message: 'Enter a valid e-mail address' }))
  .pipe(z.string().max(254));
const password = z
  .string()
  .min(PASSWORD_MIN_LENGTH, { message: `Use at least ${PASSWORD_MIN_LENGTH} characters` })
  .max(200, { message: 'Use at most 200 characters' })
  .refine((p) => !p.includes('\u0000'), { message: 'The password must not contain NUL characters' });

/** Message when a password contains the address or its local part. */
export const PASSWORD_CONTAINS_EMAIL_MESSAGE = 'Do not use your e-mail address (or the part before the @) in the password';

/**
 * True when the password is the e-mail address or contains its local part (from 3 characters
 * on), ignoring case: such a password is the first guess of anyone who knows the address.
 * The server also refuses passwords of a common-password list (not shipped to the browser).
 */
export function passwordContainsEmail(password: string, emailAddress: string): boolean {
  const p = password.toLowerCase();
  const e = emailAddress.trim().toLowerCase();
  if (!e) return false;
  if (p === e || p.includes(e)) return true;
  const local = e.split('@')[0] ?? '';
  return local.length >= 3 && p.includes(local);
}

/** Opaque link tokens (reset, invitation): URL-safe base64 as mailed. */
export const linkTokenSchema = z
  .string()
  .min(20, { message: 'The link is incomplete' })
  .max(200)
  .regex(/^[A-Za-z0-9_-]+$/, { message: 'The link is damaged: copy the whole link from the mail' });

/** POST /api/auth/sign-in */
export const signInSchema = z.object({
  email,
  password: z.string().min(1, { message: 'Enter your password' }).max(200),
});
export type SignInInput = z.infer<typeof signInSchema>;

/** POST /api/auth/sign-up: self-registration always creates a proposer. */
export const signUpSchema = z
  .object({
    email,
    password,
    displayName: safeText(z.string().trim().min(1, { message: 'Enter your name' }).max(120)),
    affiliation: safeText(z.string().trim().max(200)).default(''),
  })
  .superRefine((v, ctx) => {
    if (passwordContainsEmail(v.password, v.email))
      ctx.addIssue({ code: 'custom', path: ['password'], message: PASSWORD_CONTAINS_EMAIL_MESSAGE });
  });
export type SignUpInput = z.input<typeof signUpSchema>;

/**
 * Answer of POST /api/auth/sign-up (202), the same whether or not the address has an account
 * already, so that the form cannot be used to find out who has one: the mail tells the rest
 * (a welcome for a new account; a note with the way to reset the password for an existing one).
 */
export interface SignUpAccepted {
  message: string;
}

/** The message of SignUpAccepted. */
export const SIGN_UP_ACCEPTED_MESSAGE = 'Thank you. Check your inbox: we have sent you an e-mail about your account.';

/** POST /api/auth/password-reset: always answers 202 so that it does not reveal which e-mails exist. */
export const passwordResetRequestSchema = z.object({ email });
export type PasswordResetRequestInput = z.infer<typeof passwordResetRequestSchema>;

/** POST /api/auth/password-reset/confirm */
export const passwordResetConfirmSchema = z.object({
  token: linkTokenSchema,
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
  search: safeText(z.string().trim().max(200)).optional(),
  role: z.enum(ROLES).optional(),
  page: z.coerce.number().int().min(1).max(1_000_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
});
export type ListAccountsQuery = z.infer<typeof listAccountsQuerySchema>;

export interface AccountPage {
  items: AccountSummary[];
  total: number;
}
