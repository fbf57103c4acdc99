import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DrawingView, ReimportInput } from '@shared/schemas/drawing.schema';
import { api } from '@/lib/api-client';

/** Imports a stored version again with other options; a 422 leaves it as it was. */
export function reimportDrawing({ drawingId, input }: { drawingId: number; input: ReimportInput }): Promise<DrawingView> {
  return api.post<DrawingView>(`/api/drawings/${drawingId}/reimport`, input);
}

export function useReimportDrawing() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: reimportDrawing,
    meta: { errorsShownInline: true },
    onSuccess: (drawing) => {
      queryClient.setQueryData(['drawings', drawing.id], drawing);
      // A drafter's My work lists drawings whose newest version failed or has warnings.
      void queryClient.invalidateQueries({ queryKey: ['me', 'work'] });
      // The version list's counts and the truss's working model follow the import.
      return queryClient.invalidateQueries({
        predicate: (q) => q.queryKey[0] === 'trusses' && q.queryKey[1] === drawing.trussId && q.queryKey.length > 2,
      });
    },
  });
}
