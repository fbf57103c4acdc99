import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { ROLES, inviteUserSchema, type InviteUserInput } from '@shared/schemas/auth.schema';
import { Button } from '@/components/ui/button';
import { FormError, SelectField, TextField, MESSAGES_AFTER_TOUCH } from '@/components/ui/field';
import { applyApiError } from '@/lib/form-errors';
import { formatDateTime } from '@/lib/format';
import { ROLE_LABELS } from '@/lib/permissions';
import { useInviteUser, type InvitationCreated } from '../api/invite-user';

/** Invites a person by e-mail; shows the link too, for when the e-mail is slow. */
export function InviteUserForm({ onClose }: { onClose?: () => void }) {
  const invite = useInviteUser();
  const [created, setCreated] = useState<InvitationCreated | null>(null);
  const [copied, setCopied] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors, isSubmitting },
  } = useForm<InviteUserInput>({
    ...MESSAGES_AFTER_TOUCH,
    resolver: zodResolver(inviteUserSchema),
    defaultValues: { email: '', name: '', role: 'engineer' },
  });

  const onSubmit = handleSubmit(async (values) => {
    try {
      const result = await invite.mutateAsync(values);
      setCreated(result);
      setCopied(false);
      reset({ email: '', name: '', role: values.role });
    } catch (error) {
      applyApiError(error, setError, ['email', 'name', 'role']);
    }
  });

  const link = created ? new URL(created.link, window.location.origin).toString() : '';

  return (
    <div className="@container flex flex-col gap-4">
      <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3">
        <fieldset disabled={isSubmitting} className="grid grid-cols-1 gap-3 @2xl:grid-cols-[1.2fr_1fr_11rem]">
          <TextField label="E-mail" type="email" autoComplete="off" error={errors.email?.message} {...register('email')} />
          <TextField label="Name" autoComplete="off" error={errors.name?.message} {...register('name')} />
          <SelectField label="Role" error={errors.role?.message} {...register('role')}>
            {ROLES.map((role) => (
              <option key={role} value={role}>
                {ROLE_LABELS[role]}
              </option>
            ))}
          </SelectField>
        </fieldset>
        <FormError message={errors.root?.server?.message} />
        <div className="flex gap-2">
          <Button type="submit" variant="primary" busy={isSubmitting}>
            Send invitation
          </Button>
          {onClose && (
            <Button onClick={onClose} disabled={isSubmitting}>
              {created ? 'Done' : 'Cancel'}
            </Button>
          )}
        </div>
      </form>
      {created && (
        <div role="status" className="rounded-xs border border-accent/30 bg-accent-soft/50 px-4 py-3 text-sm">
          <p className="text-ink">
            Invitation sent to <strong className="font-semibold">{created.invitation.email}</strong> as{' '}
            {ROLE_LABELS[created.invitation.role].toLowerCase()}. The link below works once, until{' '}
            <time dateTime={created.invitation.expiresAt}>{formatDateTime(created.invitation.expiresAt)}</time>.
          </p>
          <div className="mt-2 flex gap-2">
            <input
              readOnly
              value={link}
              aria-label="Invitation link"
              onFocus={(e) => e.currentTarget.select()}
              className="h-8 min-w-0 flex-1 rounded-xs border border-paper-line bg-paper-raised px-2 font-mono text-xs text-ink-soft"
            />
            <Button
              size="sm"
              className="h-8"
              onClick={async () => {
                try {
                  await navigator.clipboard.writeText(link);
                  setCopied(true);
                } catch {
                  setCopied(false);
                }
              }}
            >
              {copied ? 'Copied' : 'Copy'}
            </Button>
          </div>
        </div>
      )}
    </div>
  );
}
