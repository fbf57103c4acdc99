import { EMAIL_SETTING_KINDS, emailSettingsUpdateSchema, type EmailSettingKind, type EmailSettings } from '@shared/schemas/email-settings.schema';
import { EmailOptOut } from '../../db/models';
import { AppError } from '../../errors/app-error';

/** Which review e-mails a person gets: every kind unless they turned it off. */
export async function getEmailSettings(userId: number): Promise<EmailSettings> {
  const off = new Set((await EmailOptOut.findAll({ attributes: ['kind'], where: { userId }, raw: true })).map((r) => r.kind));
  return Object.fromEntries(EMAIL_SETTING_KINDS.map((k) => [k, !off.has(k)])) as EmailSettings;
}

/**
 * Turns review e-mails on or off for one person. The whole body is judged before anything is
 * written: an unknown setting name or a value that is not true or false is one 422 sentence.
 */
export async function updateEmailSettings(userId: number, body: unknown): Promise<EmailSettings> {
  if (body === null || typeof body !== 'object' || Array.isArray(body)) {
    throw new AppError('email-settings-invalid', `Send the e-mail settings as an object such as {"returned": false}, naming ${EMAIL_SETTING_KINDS.join(', ')}.`, 422);
  }
  const parsed = emailSettingsUpdateSchema.safeParse(body);
  if (!parsed.success) throw new AppError('email-settings-invalid', parsed.error.issues[0].message, 422);
  const update = parsed.data;
  const sequelize = EmailOptOut.sequelize!;
  await sequelize.transaction(async (transaction) => {
    for (const kind of EMAIL_SETTING_KINDS) {
      const wanted = update[kind];
      if (wanted === undefined) continue;
      if (wanted) await EmailOptOut.destroy({ where: { userId, kind }, transaction });
      else if (!(await EmailOptOut.findOne({ where: { userId, kind }, transaction }))) await EmailOptOut.create({ userId, kind }, { transaction });
    }
  });
  return getEmailSettings(userId);
}

/** Of these people, the ones who turned this e-mail off. */
export async function optedOut(kind: EmailSettingKind, userIds?: number[]): Promise<Set<number>> {
  const where = userIds ? { kind, userId: userIds } : { kind };
  return new Set((await EmailOptOut.findAll({ attributes: ['userId'], where, raw: true })).map((r) => r.userId));
}
