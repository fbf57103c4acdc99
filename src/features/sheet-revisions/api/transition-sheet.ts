import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SheetAction, SheetRevisionView } from '@shared/schemas/review.schema';
import { api } from '@/lib/api-client';

export function transitionSheet({ sheetId, action, note }: { sheetId: number; action: SheetAction; note: string }): Promise<SheetRevisionView> {
  return api.post<SheetRevisionView>(`/api/sheets/${sheetId}/${action}`, { note });
}

/** Submit, return, check or issue a revision; the answer is the revision as it now stands. */
export function useTransitionSheet() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: transitionSheet,
    meta: { errorsShownInline: true },
    onSuccess: (sheet) => {
      queryClient.setQueryData(['sheets', sheet.id], sheet);
      // Issuing supersedes the truss's earlier issued revision and fills the archive.
      void queryClient.invalidateQueries({ queryKey: ['sheets'] });
      void queryClient.invalidateQueries({ queryKey: ['archive'] });
      return queryClient.invalidateQueries({ queryKey: ['trusses', sheet.trussId, 'sheets'] });
    },
    // Lost to someone acting at the same time: show the status as it is now.
    onError: (_error, { sheetId }) => queryClient.invalidateQueries({ queryKey: ['sheets', sheetId] }),
  });
}
