import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdateUserInput, UserView } from '@shared/schemas/auth.schema';
import { api } from '@/lib/api-client';

export function updateUser({ id, ...changes }: UpdateUserInput & { id: number }): Promise<UserView> {
  return api.patch<UserView>(`/api/users/${id}`, changes);
}

export function useUpdateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateUser,
    onSuccess: (user) => {
      queryClient.setQueryData<UserView[]>(['users'], (users) => users?.map((u) => (u.id === user.id ? user : u)));
      return queryClient.invalidateQueries({ queryKey: ['users'] });
    },
  });
}
