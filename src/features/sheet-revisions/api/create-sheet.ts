import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { NewSheetRevisionInput, SheetRevisionView } from '@shared/schemas/review.schema';
import { api } from '@/lib/api-client';

export function createSheet({ trussId, input }: { trussId: number; input: NewSheetRevisionInput }): Promise<SheetRevisionView> {
  return api.post<SheetRevisionView>(`/api/trusses/${trussId}/sheets`, input);
}

/** Starts a draft revision of the truss's calc sheet from one of its solved runs. */
export function useCreateSheet() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createSheet,
    meta: { errorsShownInline: true },
    onSuccess: (sheet) => {
      queryClient.setQueryData(['sheets', sheet.id], sheet);
      return queryClient.invalidateQueries({ queryKey: ['trusses', sheet.trussId, 'sheets'] });
    },
  });
}
