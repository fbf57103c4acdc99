import { EMAIL_SETTING_KINDS, EMAIL_SETTING_LABELS } from '@shared/schemas/email-settings.schema';
import { useEmailSettings, useUpdateEmailSettings } from '../api/email-settings';

/** Checkboxes for the review e-mails; each change is saved at once. */
export function EmailSettingsForm() {
  const settings = useEmailSettings();
  const update = useUpdateEmailSettings();
  if (settings.isPending) return <p className="text-sm text-ink-faint">Loading your e-mail settings…</p>;
  if (settings.isError) return <p className="text-sm text-ink-soft">Your e-mail settings could not be loaded. Reload the page to try again.</p>;
  return (
    <fieldset className="space-y-2" disabled={update.isPending}>
      <legend className="mb-2 text-sm text-ink-soft">E-mail me when:</legend>
      {EMAIL_SETTING_KINDS.map((kind) => (
        <label key={kind} className="flex items-center gap-2 text-sm text-ink">
          <input type="checkbox" checked={settings.data[kind]} onChange={(e) => update.mutate({ [kind]: e.target.checked })} />
          {EMAIL_SETTING_LABELS[kind]}
        </label>
      ))}
      <p className="pt-2 text-xs text-ink-faint">Password and invitation e-mails are always sent.</p>
    </fieldset>
  );
}
