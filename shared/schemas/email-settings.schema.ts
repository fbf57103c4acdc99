import { z } from 'zod';

/**
 * The review e-mails a person may turn off, one setting each. Password and invitation e-mails
 * are not among them: they are always sent.
 */
export const EMAIL_SETTING_KINDS = ['submitted', 'returned', 'checked', 'issued'] as const;
export type EmailSettingKind = (typeof EMAIL_SETTING_KINDS)[number];

/** What each setting is called on the account page. */
export const EMAIL_SETTING_LABELS: Record<EmailSettingKind, string> = {
  submitted: 'A revision is sent for checking',
  returned: 'A revision is returned with comments',
  checked: 'A revision is checked',
  issued: 'A revision is issued',
};

/** GET answer and PUT body: every setting, true when the person gets that e-mail. */
export type EmailSettings = Record<EmailSettingKind, boolean>;

/**
 * PUT /api/me/email-settings: some or all settings, each true or false. An unknown name or a
 * value that is not a boolean is refused with one sentence and nothing is written.
 */
export const emailSettingsUpdateSchema = z
  .record(z.string(), z.unknown())
  .superRefine((body, ctx) => {
    for (const [name, value] of Object.entries(body)) {
      if (!(EMAIL_SETTING_KINDS as readonly string[]).includes(name)) {
        ctx.addIssue({
          code: 'custom',
          path: [name],
          message: `"${name}" is not an e-mail setting; use ${EMAIL_SETTING_KINDS.join(', ')}.`,
        });
      } else if (typeof value !== 'boolean') {
        ctx.addIssue({ code: 'custom', path: [name], message: `Set "${name}" to true or false.` });
      }
    }
  })
  .transform((body) => body as Partial<EmailSettings>);
export type EmailSettingsUpdate = Partial<EmailSettings>;
