import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SheetAction, SheetRevisionView } from '@shared/schemas/review.schema';
import { api } from '@/lib/api-client';

export function transitionSheet({ sheetId, action, note, checkerId }: { sheetId: number; action: SheetAction; note: string; checkerId?: number }): Promise<SheetRevisionView> {
  return api.post<SheetRevisionView>(`/api/sheets/${sheetId}/${action}`, action === 'submit' ? { note, checkerId } : { note });
}

/** Submit (naming the checker), return, check or issue a revision; the answer is the revision as it now stands. */
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
      // The signed-in person's work list (and the count in the bar) changes with every move.
      void queryClient.invalidateQueries({ queryKey: ['me', 'work'] });
      return queryClient.invalidateQueries({ queryKey: ['trusses', sheet.trussId, 'sheets'] });
    },
    // Lost to someone acting at the same time: show the status as it is now.
    onError: (_error, { sheetId }) => queryClient.invalidateQueries({ queryKey: ['sheets', sheetId] }),
  });
}

export function reassignChecker({ sheetId, checkerId, note }: { sheetId: number; checkerId: number; note: string }): Promise<SheetRevisionView> {
  return api.post<SheetRevisionView>(`/api/sheets/${sheetId}/checker`, { checkerId, note });
}

/** An admin hands a revision in check to another checker. */
export function useReassignChecker() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: reassignChecker,
    meta: { errorsShownInline: true },
    onSuccess: (sheet) => {
      queryClient.setQueryData(['sheets', sheet.id], sheet);
      void queryClient.invalidateQueries({ queryKey: ['me', 'work'] });
      return queryClient.invalidateQueries({ queryKey: ['trusses', sheet.trussId, 'sheets'] });
    },
    onError: (_error, { sheetId }) => queryClient.invalidateQueries({ queryKey: ['sheets', sheetId] }),
  });
}
