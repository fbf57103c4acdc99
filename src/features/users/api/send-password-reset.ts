import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export interface PasswordResetSent {
  email: string;
  expiresAt: string;
}

/** An admin e-mails a user a one-time link to choose a new password. */
export function sendPasswordReset({ id }: { id: number }): Promise<PasswordResetSent> {
  return api.post<PasswordResetSent>(`/api/users/${id}/password-reset`, {});
}

export function useSendPasswordReset() {
  return useMutation({ mutationFn: sendPasswordReset });
}
