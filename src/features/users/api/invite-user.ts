import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { InvitationView, InviteUserInput } from '@shared/schemas/auth.schema';
import { api } from '@/lib/api-client';

export interface InvitationCreated {
  invitation: InvitationView;
  /** The link the invited person opens to set a password. */
  link: string;
}

export function inviteUser(input: InviteUserInput): Promise<InvitationCreated> {
  return api.post<InvitationCreated>('/api/users/invitations', input);
}

export function useInviteUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: inviteUser,
    meta: { errorsShownInline: true },
    // The invited person is listed as pending; the e-mail lands in the outbox.
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: ['users'] }),
        queryClient.invalidateQueries({ queryKey: ['outbox'] }),
      ]),
  });
}
