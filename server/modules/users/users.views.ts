import type { UserView } from '@shared/schemas/auth.schema';
import type { User } from '../../db/models';

export function toUserView(user: User): UserView {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    disabled: Boolean(user.disabled),
    pending: user.passwordHash === null,
    createdAt: new Date(user.createdAt).toISOString(),
  };
}
