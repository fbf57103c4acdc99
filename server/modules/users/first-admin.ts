import { Invitation, User } from '../../db/models';
import { hashToken, newInvitationToken } from '../auth/auth.service';

const FIRST_ADMIN_HOURS = 24;

/** A first-admin link younger than this is left alone by another start (see below). */
export const FIRST_ADMIN_FRESH_MS = 2 * 60 * 1000;

export type FirstAdminLink = { kind: 'made'; link: string } | { kind: 'recent'; madeAt: Date } | null;

/**
 * A database with no accounts at all (a production install without the demo) gets its
 * first admin by a one-time link printed at start: the account is made without a password,
 * and the link lets whoever runs the server choose it. Each start while the link is unused
 * makes a fresh link (the previous one stops working), except when an unused link is younger
 * than FIRST_ADMIN_FRESH_MS: then another server process has just printed it (two app processes
 * started together), and replacing it would leave the operator a dead link in that log; this
 * start makes none and says where to look. Returns null once anyone has an account with a
 * password. Runs under the start lock (bootstrap.ts), so two starts do not both make the admin.
 */
export async function firstAdminLink(opts: { email: string; publicUrl: string; now?: Date }): Promise<FirstAdminLink> {
  const sequelize = User.sequelize!;
  const now = opts.now ?? new Date();
  return sequelize.transaction(async (transaction) => {
    const users = await User.findAll({ transaction });
    if (users.some((u) => u.passwordHash)) return null;
    let admin = users.find((u) => u.role === 'admin');
    if (!admin) {
      admin = await User.create({ email: opts.email, name: 'First admin', role: 'admin', passwordHash: null }, { transaction });
    }
    const open = await Invitation.findOne({ where: { userId: admin.id, usedAt: null }, order: [['createdAt', 'DESC']], transaction });
    if (open && open.expiresAt > now && now.getTime() - new Date(open.createdAt).getTime() < FIRST_ADMIN_FRESH_MS) {
      return { kind: 'recent', madeAt: new Date(open.createdAt) };
    }
    await Invitation.destroy({ where: { userId: admin.id, usedAt: null }, transaction });
    const token = newInvitationToken();
    await Invitation.create(
      { tokenHash: hashToken(token), userId: admin.id, invitedById: null, expiresAt: new Date(now.getTime() + FIRST_ADMIN_HOURS * 3600 * 1000), usedAt: null },
      { transaction },
    );
    return { kind: 'made', link: `${opts.publicUrl.replace(/\/$/, '')}/invite/${token}` };
  });
}
