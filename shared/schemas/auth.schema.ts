import { z } from 'zod';

export const roleSchema = z.enum(['drafter', 'engineer', 'reviewer', 'admin'], { error: 'Choose a role: drafter, engineer, reviewer or admin.' });
export type Role = z.infer<typeof roleSchema>;
export const ROLES: readonly Role[] = roleSchema.options;

export const signInSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter an e-mail address like name@firm.com.'),
  password: z.string().min(1, 'Enter your password.').max(200, 'Passwords here are at most 200 characters; check what was pasted.'),
});
export type SignInInput = z.infer<typeof signInSchema>;

/** Minimum length of a password set through the app (the server also refuses guessable ones). */
export const PASSWORD_MIN_LENGTH = 12;

export const passwordSchema = z
  .string({ error: 'Enter a password.' })
  .min(PASSWORD_MIN_LENGTH, `Use at least ${PASSWORD_MIN_LENGTH} characters.`)
  .max(200, 'Use at most 200 characters.');

const emailSchema = z.string({ error: 'Enter an e-mail address like name@firm.com.' }).trim().toLowerCase().email('Enter an e-mail address like name@firm.com.');
const tokenSchema = z.string({ error: 'The link is incomplete. Open the link from the e-mail again.' }).min(20, 'The link is incomplete. Open the link from the e-mail again.').max(200, 'The link is not valid. Open the link from the e-mail again.');

export const changePasswordSchema = z.object({
  currentPassword: z.string({ error: 'Enter your current password.' }).min(1, 'Enter your current password.').max(200, 'That is not your current password.'),
  newPassword: passwordSchema,
});
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>;

export const requestPasswordResetSchema = z.object({ email: emailSchema });
export type RequestPasswordResetInput = z.infer<typeof requestPasswordResetSchema>;

export const completePasswordResetSchema = z.object({ token: tokenSchema, password: passwordSchema });
export type CompletePasswordResetInput = z.infer<typeof completePasswordResetSchema>;

/** What a reset link shows before the new password is chosen. */
export interface PasswordResetView {
  email: string;
  name: string;
  expiresAt: string;
}

/** The answer to a self-service request: the same sentence whether or not the address has an account. */
export interface PasswordResetRequested {
  message: string;
}

export const acceptInvitationSchema = z.object({
  token: z.string().min(20).max(200),
  name: z.string().trim().min(1, 'Enter your name as it should read on sheets, e.g. "Eli Marsh".').max(120, 'Shorten your name to 120 characters or fewer.'),
  password: passwordSchema,
});
export type AcceptInvitationInput = z.infer<typeof acceptInvitationSchema>;

export const inviteUserSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter an e-mail address like name@firm.com.'),
  name: z.string().trim().min(1, 'Enter the person’s name, e.g. "Dana Whitlock".').max(120, 'Shorten the name to 120 characters or fewer.'),
  role: roleSchema,
});
export type InviteUserInput = z.infer<typeof inviteUserSchema>;

export const updateUserSchema = z
  .object({ role: roleSchema.optional(), disabled: z.boolean().optional() })
  .refine((v) => v.role !== undefined || v.disabled !== undefined, 'Say what to change: role or disabled.');
export type UpdateUserInput = z.infer<typeof updateUserSchema>;

/** A user as the API shows it; never carries the password hash. */
export interface UserView {
  id: number;
  email: string;
  name: string;
  role: Role;
  disabled: boolean;
  /** Invited but has not yet set a password. */
  pending: boolean;
  createdAt: string;
}

export interface SessionView {
  user: UserView | null;
  /** Send back as the X-CSRF-Token header on every write. */
  csrfToken: string;
}

export interface InvitationView {
  email: string;
  name: string;
  role: Role;
  expiresAt: string;
}

export interface OutboxMessageView {
  id: number;
  from: string;
  to: string[];
  subject: string;
  text: string;
  receivedAt: string;
}
