import bcrypt from 'bcryptjs';
import { Op, type Transaction } from 'sequelize';
import type { ChangePasswordInput, CompletePasswordResetInput, PasswordResetView } from '@shared/schemas/auth.schema';
import { AppError, notFound } from '../../errors/app-error';
import { PasswordReset, User } from '../../db/models';
import type { Mailer } from '../../mail/mailer';
import { hashToken, newInvitationToken } from './auth.service';
import { assertPasswordAllowed } from './password-judge';

/** A reset link works for one hour. */
export const RESET_LINK_MINUTES = 60;
/** A self-service request for an address that was sent a link this recently sends nothing more. */
const SELF_SERVICE_GAP_MS = 60 * 1000;

/** The one answer to "forgot password", whether or not the address has an account. */
export const RESET_REQUESTED_MESSAGE =
  'If that address belongs to an account here, a reset link is on its way: it works once within the hour, so check your inbox (and spam folder) now.';

export interface ResetMailDeps {
  mailer: Mailer;
  publicUrl: string;
  firmName: string;
}

/** Words an attacker would try first for this person (see judgePassword). */
const personalWords = (user: User, firmName: string) => [user.email, user.name, firmName];

/** Raises the user's session epoch (signing out every session made before) and sets the hash. */
async function setPassword(userId: number, passwordHash: string, transaction: Transaction): Promise<void> {
  const sequelize = User.sequelize!;
  await User.update(
    { passwordHash, sessionEpoch: sequelize.literal('"sessionEpoch" + 1') as unknown as number },
    { where: { id: userId }, transaction },
  );
  // Links sent before this change are void: the password they would replace is gone.
  await PasswordReset.update({ usedAt: new Date() }, { where: { userId, usedAt: null }, transaction });
  // The epoch already refuses the user's older sessions; their rows go too (the current tab is
  // signed in again into a fresh session by the caller). connect-session-sequelize keeps each
  // session as JSON text, with passport's { id, epoch } under passport.user.
  // JSON functions differ: SQLite's json_extract; PostgreSQL's #>> on the text cast to json
  // (which yields text, so the id is compared as text there).
  const sql =
    sequelize.getDialect() === 'postgres'
      ? `DELETE FROM "Sessions" WHERE ("data"::json #>> '{passport,user,id}') = :userText OR ("data"::json #>> '{passport,user}') = :userText`
      : `DELETE FROM "Sessions" WHERE json_extract("data", '$.passport.user.id') = :userId OR json_extract("data", '$.passport.user') = :userId`;
  await sequelize.query(sql, {
    replacements: { userId, userText: String(userId) },
    transaction,
  });
}

/**
 * A signed-in user changes their own password: the current one is required, the new one must
 * pass the rule and differ from it. Every session of the user made before is signed out (the
 * caller signs the current tab in again). Nothing is written when any check fails.
 */
export async function changePassword(userId: number, input: ChangePasswordInput, bcryptRounds: number, firmName: string): Promise<User> {
  const user = await User.findByPk(userId);
  if (!user || !user.passwordHash) throw notFound('Your account');
  if (!(await bcrypt.compare(input.currentPassword, user.passwordHash))) {
    const message = 'Your current password is not right: type it again, or sign out and use “Forgot password” on the sign-in page.';
    throw new AppError('wrong-current-password', message, 400, { currentPassword: message });
  }
  if (input.newPassword === input.currentPassword) {
    const message = 'The new password is the same as the current one: choose a different one.';
    throw new AppError('same-password', message, 400, { newPassword: message });
  }
  await assertPasswordAllowed(input.newPassword, personalWords(user, firmName), 'newPassword');
  const passwordHash = await bcrypt.hash(input.newPassword, bcryptRounds);
  await User.sequelize!.transaction((transaction) => setPassword(user.id, passwordHash, transaction));
  await user.reload();
  return user;
}

/**
 * Makes a new reset link for the user and e-mails it; once sent, every unused older link is
 * deleted, so only the newest works. When the mail cannot be sent, nothing is left changed.
 */
async function sendResetLink(user: User, requestedBy: User | null, deps: ResetMailDeps): Promise<Date> {
  const token = newInvitationToken();
  const expiresAt = new Date(Date.now() + RESET_LINK_MINUTES * 60 * 1000);
  const created = await PasswordReset.create({
    tokenHash: hashToken(token),
    userId: user.id,
    requestedById: requestedBy?.id ?? null,
    expiresAt,
    usedAt: null,
  });
  const link = `${deps.publicUrl.replace(/\/$/, '')}/reset-password/${token}`;
  const why = requestedBy
    ? `${requestedBy.name}, an admin at ${deps.firmName}, has sent you a link to choose a new Panelpoint password.`
    : `Someone asked to reset the Panelpoint password of this address at ${deps.firmName}.`;
  const mail = {
    to: user.email,
    subject: 'Choose a new Panelpoint password',
    text: [
      `Hello ${user.name},`,
      '',
      why,
      `Open this link to choose it; it works once and expires in ${RESET_LINK_MINUTES} minutes (${expiresAt.toISOString().slice(0, 16).replace('T', ' ')} UTC):`,
      '',
      link,
      '',
      'Choosing a new password signs you out everywhere else.',
      'If you did not ask for this, ignore this message: your password stays as it is.',
    ].join('\n'),
  };
  try {
    await deps.mailer.send(mail);
  } catch (err) {
    // A link nobody received is of no use; leave no row behind for it.
    await created.destroy();
    throw new AppError(
      'mail-not-sent',
      `The reset e-mail to ${user.email} could not be sent (${err instanceof Error ? err.message : 'mail server error'}): check the mail settings (SMTP_URL) and try again.`,
      502,
    );
  }
  // Sent: from now on only the newest link works.
  await PasswordReset.destroy({ where: { userId: user.id, usedAt: null, id: { [Op.ne]: created.id } } });
  return expiresAt;
}

/**
 * Self-service "forgot password". Sends a link only to an active account with a password,
 * and not again within a minute of the last link; the caller answers the same sentence in
 * every case, so the answer does not tell whether an address has an account.
 */
export async function requestPasswordReset(email: string, deps: ResetMailDeps): Promise<void> {
  const user = await User.findOne({ where: { email } });
  if (!user || !user.passwordHash || user.disabled) return;
  const recent = await PasswordReset.count({
    where: { userId: user.id, usedAt: null, createdAt: { [Op.gt]: new Date(Date.now() - SELF_SERVICE_GAP_MS) } },
  });
  if (recent > 0) return;
  await sendResetLink(user, null, deps);
}

/** An admin sends a user a reset link; the user's password stays until the link is used. */
export async function adminSendPasswordReset(userId: number, actor: User, deps: ResetMailDeps): Promise<{ email: string; expiresAt: string }> {
  const user = await User.findByPk(userId);
  if (!user) throw notFound('That user');
  if (!user.passwordHash) {
    throw new AppError('user-pending', `${user.email} has not accepted their invitation yet: send the invitation again instead.`, 409);
  }
  if (user.disabled) {
    throw new AppError('user-disabled', `${user.email} is disabled: enable the account first, then send the reset link.`, 409);
  }
  const expiresAt = await sendResetLink(user, actor, deps);
  return { email: user.email, expiresAt: expiresAt.toISOString() };
}

async function findUsableReset(token: string): Promise<{ reset: PasswordReset; user: User }> {
  const reset = await PasswordReset.findOne({ where: { tokenHash: hashToken(token) } });
  if (!reset) {
    throw new AppError('reset-not-found', 'This reset link is not valid (a newer link replaces older ones): use the newest e-mail, or ask for a new link on the sign-in page.', 404);
  }
  if (reset.usedAt) {
    throw new AppError('reset-used', 'This reset link has already been used: sign in with your password, or ask for a new link on the sign-in page.', 410);
  }
  if (reset.expiresAt.getTime() <= Date.now()) {
    throw new AppError('reset-expired', `This reset link has expired (links work for ${RESET_LINK_MINUTES} minutes): ask for a new one on the sign-in page.`, 410);
  }
  const user = await User.findByPk(reset.userId);
  if (!user || user.disabled || !user.passwordHash) {
    throw new AppError('reset-not-found', 'This reset link is no longer valid: ask your admin for help signing in.', 404);
  }
  return { reset, user };
}

export async function getPasswordReset(token: string): Promise<PasswordResetView> {
  const { reset, user } = await findUsableReset(token);
  return { email: user.email, name: user.name, expiresAt: reset.expiresAt.toISOString() };
}

/**
 * Sets the new password from a reset link. The link is claimed with a conditional update (still
 * unused and unexpired), so two requests racing with it cannot both succeed; every other link
 * of the user becomes void and every session of the user is signed out.
 */
export async function completePasswordReset(input: CompletePasswordResetInput, bcryptRounds: number, firmName: string): Promise<User> {
  const { reset, user } = await findUsableReset(input.token);
  await assertPasswordAllowed(input.password, personalWords(user, firmName));
  const passwordHash = await bcrypt.hash(input.password, bcryptRounds);
  await User.sequelize!.transaction(async (transaction) => {
    const [claimed] = await PasswordReset.update(
      { usedAt: new Date() },
      { where: { id: reset.id, usedAt: null, expiresAt: { [Op.gt]: new Date() } }, transaction },
    );
    if (claimed !== 1) {
      throw new AppError('reset-used', 'This reset link has already been used: sign in with your password, or ask for a new link on the sign-in page.', 410);
    }
    await setPassword(user.id, passwordHash, transaction);
  });
  await user.reload();
  return user;
}
