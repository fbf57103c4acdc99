import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SheetCommentView } from '@shared/schemas/review.schema';
import { api } from '@/lib/api-client';

export function resolveSheetComment({ commentId, resolved }: { commentId: number; resolved: boolean; sheetId: number; trussId: number }): Promise<SheetCommentView> {
  return api.patch<SheetCommentView>(`/api/sheet-comments/${commentId}`, { resolved });
}

/** Marks a thread resolved, or open again; `sheetId` and `trussId` say which lists to refresh. */
export function useResolveSheetComment() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: resolveSheetComment,
    onSuccess: (_comment, { sheetId, trussId }) => {
      // The truss's revision list counts open threads.
      void queryClient.invalidateQueries({ queryKey: ['trusses', trussId, 'sheets'] });
      return queryClient.invalidateQueries({ queryKey: ['sheets', sheetId] });
    },
  });
}
