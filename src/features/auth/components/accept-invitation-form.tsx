import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { acceptInvitationSchema, PASSWORD_MIN_LENGTH, type InvitationView, type SessionView } from '@shared/schemas/auth.schema';
import { Button } from '@/components/ui/button';
import { FormError, TextField, MESSAGES_AFTER_TOUCH } from '@/components/ui/field';
import { applyApiError } from '@/lib/form-errors';
import { ROLE_LABELS } from '@/lib/permissions';
import { useAcceptInvitation } from '../api/accept-invitation';

const acceptFormSchema = acceptInvitationSchema
  .extend({ repeatPassword: z.string() })
  .refine((v) => v.password === v.repeatPassword, {
    path: ['repeatPassword'],
    message: 'The two passwords differ. Type the same password twice.',
  });
type AcceptFormInput = z.input<typeof acceptFormSchema>;

interface AcceptInvitationFormProps {
  token: string;
  invitation: InvitationView;
  onAccepted: (session: SessionView) => void;
}

export function AcceptInvitationForm({ token, invitation, onAccepted }: AcceptInvitationFormProps) {
  const accept = useAcceptInvitation();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<AcceptFormInput>({
    ...MESSAGES_AFTER_TOUCH,
    resolver: zodResolver(acceptFormSchema),
    defaultValues: { token, name: invitation.name, password: '', repeatPassword: '' },
  });

  const onSubmit = handleSubmit(async ({ name, password }) => {
    try {
      onAccepted(await accept.mutateAsync({ token, name, password }));
    } catch (error) {
      applyApiError(error, setError, ['name', 'password']);
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <dl className="grid grid-cols-[auto_minmax(0,1fr)] gap-x-4 gap-y-1 rounded-xs border border-paper-line bg-paper-sunk/60 px-4 py-3 text-sm">
        <dt className="whitespace-nowrap text-ink-faint">E-mail</dt>
        <dd className="font-medium break-all text-ink">{invitation.email}</dd>
        <dt className="text-ink-faint">Role</dt>
        <dd className="font-medium text-ink">{ROLE_LABELS[invitation.role]}</dd>
      </dl>
      <fieldset disabled={isSubmitting} className="flex flex-col gap-4">
        <TextField label="Your name" autoComplete="name" error={errors.name?.message} {...register('name')} />
        <TextField
          label="Password"
          type="password"
          autoComplete="new-password"
          hint={`At least ${PASSWORD_MIN_LENGTH} characters and hard to guess: a phrase of four or more unrelated words works well.`}
          error={errors.password?.message}
          {...register('password')}
        />
        <TextField label="Repeat password" type="password" autoComplete="new-password" error={errors.repeatPassword?.message} {...register('repeatPassword')} />
      </fieldset>
      <FormError message={errors.root?.server?.message ?? errors.token?.message} />
      <Button type="submit" variant="primary" busy={isSubmitting}>
        Join and sign in
      </Button>
    </form>
  );
}
