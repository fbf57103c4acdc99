import { useMutation } from '@tanstack/react-query';
import type { PasswordResetRequested, RequestPasswordResetInput } from '@shared/schemas/auth.schema';
import { api } from '@/lib/api-client';

/** "Forgot password": the answer is the same sentence whether or not the address has an account. */
export function requestPasswordReset(input: RequestPasswordResetInput): Promise<PasswordResetRequested> {
  return api.post<PasswordResetRequested>('/api/password-resets', input);
}

export function useRequestPasswordReset() {
  return useMutation({ mutationFn: requestPasswordReset, meta: { errorsShownInline: true } });
}
