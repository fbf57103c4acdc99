import type { InviteUserInput, UpdateUserInput, UserView, InvitationView } from '@shared/schemas/auth.schema';
import { AppError, notFound } from '../../errors/app-error';
import { Invitation, User } from '../../db/models';
import type { Mailer } from '../../mail/mailer';
import { hashToken, newInvitationToken } from '../auth/auth.service';
import { toUserView } from './users.views';

const INVITATION_DAYS = 7;

export async function listUsers(): Promise<UserView[]> {
  const users = await User.findAll({ order: [['name', 'ASC']] });
  return users.map(toUserView);
}

/**
 * Creates the account without a password and e-mails a one-time link to set it. Inviting an
 * address again while the first link is unused sends a fresh link (the old one stops working).
 */
export async function inviteUser(
  input: InviteUserInput,
  invitedBy: User,
  deps: { mailer: Mailer; publicUrl: string; firmName: string },
): Promise<{ invitation: InvitationView; link: string }> {
  const token = newInvitationToken();
  const expiresAt = new Date(Date.now() + INVITATION_DAYS * 24 * 3600 * 1000);
  const sequelize = User.sequelize!;
  const user = await sequelize.transaction(async (transaction) => {
    let user = await User.findOne({ where: { email: input.email }, transaction });
    if (user && user.passwordHash) {
      throw new AppError('user-exists', `${input.email} already has an account. Change their role on the users page instead.`, 409);
    }
    if (user) {
      await user.update({ name: input.name, role: input.role }, { transaction });
      await Invitation.destroy({ where: { userId: user.id, usedAt: null }, transaction });
    } else {
      user = await User.create({ email: input.email, name: input.name, role: input.role, passwordHash: null }, { transaction });
    }
    await Invitation.create(
      { tokenHash: hashToken(token), userId: user.id, invitedById: invitedBy.id, expiresAt, usedAt: null },
      { transaction },
    );
    return user;
  });
  const link = `${deps.publicUrl.replace(/\/$/, '')}/invite/${token}`;
  await deps.mailer.send({
    to: user.email,
    subject: `You are invited to Panelpoint at ${deps.firmName}`,
    text: [
      `Hello ${user.name},`,
      '',
      `${invitedBy.name} has invited you to Panelpoint at ${deps.firmName} as ${user.role}.`,
      'Open this link to choose your password; it works once and expires in 7 days:',
      '',
      link,
      '',
      'If you did not expect this, ignore this message.',
    ].join('\n'),
  });
  return {
    invitation: { email: user.email, name: user.name, role: user.role, expiresAt: expiresAt.toISOString() },
    link,
  };
}

export async function updateUser(id: number, input: UpdateUserInput, actor: User): Promise<UserView> {
  const user = await User.findByPk(id);
  if (!user) throw notFound('That user');
  if (user.id === actor.id && (input.disabled === true || (input.role && input.role !== 'admin'))) {
    throw new AppError('cannot-change-self', 'You cannot disable yourself or take away your own admin role. Ask another admin.', 409);
  }
  await user.update({
    ...(input.role !== undefined ? { role: input.role } : {}),
    ...(input.disabled !== undefined ? { disabled: input.disabled } : {}),
  });
  return toUserView(user);
}
