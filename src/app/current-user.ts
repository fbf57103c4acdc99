import type { UserView } from '@shared/schemas/auth.schema';
import { useSession } from '@/features/auth/api/get-session';

/** The signed-in person; only for pages behind the session guard. */
export function useCurrentUser(): UserView {
  const user = useSession().data?.user;
  if (!user) throw new Error('useCurrentUser is only for pages behind the session guard.');
  return user;
}
