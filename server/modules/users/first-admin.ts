import { Invitation, User } from '../../db/models';
import { hashToken, newInvitationToken } from '../auth/auth.service';

const FIRST_ADMIN_HOURS = 24;

/**
 * A database with no accounts at all (a production install without the demo) gets its
 * first admin by a one-time link printed at start: the account is made without a password,
 * and the link lets whoever runs the server choose it. Each start while the link is unused
 * makes a fresh link (the previous one stops working). Returns null once anyone has an account
 * with a password.
 */
export async function firstAdminLink(opts: { email: string; publicUrl: string }): Promise<string | null> {
  const sequelize = User.sequelize!;
  return sequelize.transaction(async (transaction) => {
    const users = await User.findAll({ transaction });
    if (users.some((u) => u.passwordHash)) return null;
    let admin = users.find((u) => u.role === 'admin');
    if (!admin) {
      admin = await User.create({ email: opts.email, name: 'First admin', role: 'admin', passwordHash: null }, { transaction });
    }
    await Invitation.destroy({ where: { userId: admin.id, usedAt: null }, transaction });
    const token = newInvitationToken();
    await Invitation.create(
      { tokenHash: hashToken(token), userId: admin.id, invitedById: null, expiresAt: new Date(Date.now() + FIRST_ADMIN_HOURS * 3600 * 1000), usedAt: null },
      { transaction },
    );
    return `${opts.publicUrl.replace(/\/$/, '')}/invite/${token}`;
  });
}
