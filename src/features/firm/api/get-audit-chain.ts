import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AuditChainView } from '@shared/schemas/review.schema';
import { api } from '@/lib/api-client';

export function getAuditChain(): Promise<AuditChainView> {
  return api.get<AuditChainView>('/api/admin/audit-chain');
}

export function getAuditChainQueryOptions() {
  return queryOptions({ queryKey: ['admin', 'audit-chain'], queryFn: getAuditChain, staleTime: 0 });
}

export function useAuditChain() {
  return useQuery(getAuditChainQueryOptions());
}
