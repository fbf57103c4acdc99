import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { NewSheetCommentInput, SheetCommentView } from '@shared/schemas/review.schema';
import { api } from '@/lib/api-client';

export function addSheetComment({ sheetId, input }: { sheetId: number; input: NewSheetCommentInput }): Promise<SheetCommentView> {
  return api.post<SheetCommentView>(`/api/sheets/${sheetId}/comments`, input);
}

/** A new thread on a step (by anchor), or a reply to a thread (by parentId). */
export function useAddSheetComment() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: addSheetComment,
    meta: { errorsShownInline: true },
    onSuccess: (_comment, { sheetId }) => queryClient.invalidateQueries({ queryKey: ['sheets', sheetId] }),
  });
}
