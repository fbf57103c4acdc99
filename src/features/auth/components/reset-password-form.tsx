import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { completePasswordResetSchema, PASSWORD_MIN_LENGTH, type PasswordResetView, type SessionView } from '@shared/schemas/auth.schema';
import { Button } from '@/components/ui/button';
import { FormError, TextField, MESSAGES_AFTER_TOUCH } from '@/components/ui/field';
import { applyApiError } from '@/lib/form-errors';
import { useCompletePasswordReset } from '../api/complete-password-reset';

const resetFormSchema = completePasswordResetSchema
  .extend({ repeatPassword: z.string() })
  .refine((v) => v.password === v.repeatPassword, {
    path: ['repeatPassword'],
    message: 'The two passwords differ. Type the same password twice.',
  });
type ResetFormInput = z.input<typeof resetFormSchema>;

interface ResetPasswordFormProps {
  token: string;
  reset: PasswordResetView;
  onDone: (session: SessionView) => void;
}

export function ResetPasswordForm({ token, reset, onDone }: ResetPasswordFormProps) {
  const complete = useCompletePasswordReset();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<ResetFormInput>({ ...MESSAGES_AFTER_TOUCH, resolver: zodResolver(resetFormSchema), defaultValues: { token, password: '', repeatPassword: '' } });

  const onSubmit = handleSubmit(async ({ password }) => {
    try {
      onDone(await complete.mutateAsync({ token, password }));
    } catch (error) {
      applyApiError(error, setError, ['password']);
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <dl className="grid grid-cols-[auto_minmax(0,1fr)] gap-x-4 gap-y-1 rounded-xs border border-paper-line bg-paper-sunk/60 px-4 py-3 text-sm">
        <dt className="whitespace-nowrap text-ink-faint">E-mail</dt>
        <dd className="font-medium break-all text-ink">{reset.email}</dd>
      </dl>
      {/* Lets a password manager tie the new password to the account. */}
      <input type="hidden" autoComplete="username" value={reset.email} readOnly />
      <fieldset disabled={isSubmitting} className="flex flex-col gap-4">
        <TextField
          label="New password"
          type="password"
          autoComplete="new-password"
          autoFocus
          hint={`At least ${PASSWORD_MIN_LENGTH} characters and hard to guess: a phrase of four or more unrelated words works well.`}
          error={errors.password?.message}
          {...register('password')}
        />
        <TextField label="Repeat new password" type="password" autoComplete="new-password" error={errors.repeatPassword?.message} {...register('repeatPassword')} />
      </fieldset>
      <FormError message={errors.root?.server?.message ?? errors.token?.message} />
      <Button type="submit" variant="primary" busy={isSubmitting}>
        Set password and sign in
      </Button>
    </form>
  );
}
