import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { FirmSettings } from '@shared/schemas/project.schema';
import { api } from '@/lib/api-client';

export function updateFirm(settings: FirmSettings): Promise<FirmSettings> {
  return api.put<FirmSettings>('/api/firm', settings);
}

export function useUpdateFirm() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateFirm,
    meta: { errorsShownInline: true, successMessage: 'Firm details saved. New calc sheets use them.' },
    onSuccess: (firm) => queryClient.setQueryData(['firm'], firm),
  });
}
