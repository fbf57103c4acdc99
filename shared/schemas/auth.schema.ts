import { z } from 'zod';

export const roleSchema = z.enum(['drafter', 'engineer', 'reviewer', 'admin']);
export type Role = z.infer<typeof roleSchema>;
export const ROLES: readonly Role[] = roleSchema.options;

export const signInSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter an e-mail address like name@firm.com.'),
  password: z.string().min(1, 'Enter your password.').max(200),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const passwordSchema = z
  .string()
  .min(10, 'Use at least 10 characters.')
  .max(200, 'Use at most 200 characters.');

export const acceptInvitationSchema = z.object({
  token: z.string().min(20).max(200),
  name: z.string().trim().min(1, 'Enter your name.').max(120),
  password: passwordSchema,
});
export type AcceptInvitationInput = z.infer<typeof acceptInvitationSchema>;

export const inviteUserSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter an e-mail address like name@firm.com.'),
  name: z.string().trim().min(1, 'Enter the person’s name.').max(120),
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
