import { PageHeader, Panel } from '@/components/ui/page-header';
import { ChangePasswordForm } from '@/features/auth/components/change-password-form';
import { EmailSettingsForm } from '@/features/users/components/email-settings-form';
import { notify } from '@/lib/notices';
import { ROLE_LABELS } from '@/lib/permissions';
import { useCurrentUser } from '../current-user';

export function AccountRoute() {
  const user = useCurrentUser();
  return (
    <div>
      <PageHeader title="Your account" description="Your details as the firm’s admin set them, your password and the e-mails you get." />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
        <Panel title="Details">
          <dl className="grid grid-cols-[auto_minmax(0,1fr)] gap-x-6 gap-y-2 text-sm">
            <dt className="text-ink-faint">Name</dt>
            <dd className="font-medium text-ink">{user.name}</dd>
            <dt className="text-ink-faint">E-mail</dt>
            <dd className="break-all text-ink">{user.email}</dd>
            <dt className="text-ink-faint">Role</dt>
            <dd className="text-ink">{ROLE_LABELS[user.role]}</dd>
          </dl>
          <p className="mt-4 text-xs text-ink-faint">Ask your admin to change your name, e-mail address or role.</p>
        </Panel>
        <Panel title="Change password">
          <p className="mb-4 text-sm text-ink-soft">Changing it signs you out on every other computer and browser.</p>
          <ChangePasswordForm onChanged={() => notify('success', 'Password changed. Every other session of yours has been signed out.')} />
        </Panel>
        <Panel title="E-mails">
          <EmailSettingsForm />
        </Panel>
      </div>
    </div>
  );
}
