import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ImportLimits, ImportLimitsView } from '@shared/schemas/import-limits.schema';
import { api } from '@/lib/api-client';

export function getImportLimits(): Promise<ImportLimitsView> {
  return api.get<ImportLimitsView>('/api/firm/import-limits');
}

export function getImportLimitsQueryOptions() {
  return queryOptions({ queryKey: ['firm', 'import-limits'], queryFn: getImportLimits });
}

export function useImportLimits() {
  return useQuery(getImportLimitsQueryOptions());
}

export function updateImportLimits(limits: ImportLimits): Promise<ImportLimitsView> {
  return api.put<ImportLimitsView>('/api/firm/import-limits', limits);
}

export function useUpdateImportLimits() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateImportLimits,
    meta: { errorsShownInline: true, successMessage: 'Drawing limits saved. The next upload uses them.' },
    onSuccess: (limits) => queryClient.setQueryData(['firm', 'import-limits'], limits),
  });
}
