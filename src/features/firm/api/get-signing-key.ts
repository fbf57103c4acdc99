import { queryOptions, useQuery } from '@tanstack/react-query';
import type { FirmSigningKeyView } from '@shared/schemas/review.schema';
import { api } from '@/lib/api-client';

export function getSigningKey(): Promise<FirmSigningKeyView> {
  return api.get<FirmSigningKeyView>('/api/firm/signing-key');
}

export function getSigningKeyQueryOptions() {
  return queryOptions({ queryKey: ['firm', 'signing-key'], queryFn: getSigningKey, staleTime: Infinity });
}

/** The firm's Ed25519 public key that signs issued-sheet records (admins only). */
export function useSigningKey() {
  return useQuery(getSigningKeyQueryOptions());
}
