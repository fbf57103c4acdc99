import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { SigningKeyView } from '@shared/schemas/review.schema';
import { api } from '@/lib/api-client';

export function getSigningKeys(): Promise<SigningKeyView[]> {
  return api.get<SigningKeyView[]>('/api/firm/signing-keys');
}

export function getSigningKeysQueryOptions() {
  return queryOptions({ queryKey: ['firm', 'signing-keys'], queryFn: getSigningKeys });
}

export function useSigningKeys() {
  return useQuery(getSigningKeysQueryOptions());
}

export function rotateSigningKey(): Promise<SigningKeyView> {
  return api.post<SigningKeyView>('/api/firm/signing-keys/rotate');
}

/** Makes a new current key; the old public key stays listed so older sheets still verify. */
export function useRotateSigningKey() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: rotateSigningKey,
    meta: { successMessage: 'New signing key made. Sheets issued from now on are signed with it; older sheets keep verifying under their own key.' },
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: ['firm', 'signing-keys'] });
      await queryClient.invalidateQueries({ queryKey: ['firm', 'signing-key'] });
    },
  });
}
