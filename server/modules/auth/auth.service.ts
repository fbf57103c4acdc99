import crypto from 'node:crypto';
import bcrypt from 'bcryptjs';
import type { InvitationView } from '@shared/schemas/auth.schema';
import { AppError } from '../../errors/app-error';
import { Invitation, User } from '../../db/models';
import { assertPasswordAllowed } from './password-judge';

export const hashToken = (token: string) => crypto.createHash('sha256').update(token).digest('hex');

export function newInvitationToken(): string {
  return crypto.randomBytes(32).toString('base64url');
}

async function findUsableInvitation(token: string): Promise<{ invitation: Invitation; user: User }> {
  const invitation = await Invitation.findOne({ where: { tokenHash: hashToken(token) } });
  if (!invitation) {
    throw new AppError('invitation-not-found', 'This invitation link is not valid. Ask your admin to send a new one.', 404);
  }
  if (invitation.usedAt) {
    throw new AppError('invitation-used', 'This invitation has already been used. Sign in with the password you set, or ask your admin for a new link.', 410);
  }
  if (invitation.expiresAt.getTime() < Date.now()) {
    throw new AppError('invitation-expired', 'This invitation has expired. Ask your admin to send a new one.', 410);
  }
  const user = await User.findByPk(invitation.userId);
  if (!user || user.disabled) {
    throw new AppError('invitation-not-found', 'This invitation is no longer valid. Ask your admin to send a new one.', 404);
  }
  return { invitation, user };
}

export async function getInvitation(token: string): Promise<InvitationView> {
  const { invitation, user } = await findUsableInvitation(token);
  return { email: user.email, name: user.name, role: user.role, expiresAt: invitation.expiresAt.toISOString() };
}

/**
 * Sets the invited user's name and password. The invitation is claimed with a conditional
 * update, so two requests racing with the same link cannot both succeed.
 */
export async function acceptInvitation(
  input: { token: string; name: string; password: string },
  bcryptRounds: number,
  firmName: string,
): Promise<User> {
  const { invitation, user } = await findUsableInvitation(input.token);
  await assertPasswordAllowed(input.password, [user.email, input.name, user.name, firmName]);
  const passwordHash = await bcrypt.hash(input.password, bcryptRounds);
  const sequelize = Invitation.sequelize!;
  return sequelize.transaction(async (transaction) => {
    const [claimed] = await Invitation.update(
      { usedAt: new Date() },
      { where: { id: invitation.id, usedAt: null }, transaction },
    );
    if (claimed !== 1) {
      throw new AppError('invitation-used', 'This invitation has already been used. Sign in with the password you set.', 410);
    }
    await user.update({ name: input.name, passwordHash }, { transaction });
    return user;
  });
}
