import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { changePasswordSchema, PASSWORD_MIN_LENGTH } from '@shared/schemas/auth.schema';
import { Button } from '@/components/ui/button';
import { FormError, TextField, MESSAGES_AFTER_TOUCH } from '@/components/ui/field';
import { applyApiError } from '@/lib/form-errors';
import { useChangePassword } from '../api/change-password';

const changeFormSchema = changePasswordSchema
  .extend({ repeatPassword: z.string() })
  .refine((v) => v.newPassword === v.repeatPassword, {
    path: ['repeatPassword'],
    message: 'The two new passwords differ. Type the same password twice.',
  });
type ChangeFormInput = z.input<typeof changeFormSchema>;

/** The signed-in person's own password; on success every other session of theirs is signed out. */
export function ChangePasswordForm({ onChanged }: { onChanged: () => void }) {
  const change = useChangePassword();
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors, isSubmitting },
  } = useForm<ChangeFormInput>({
    ...MESSAGES_AFTER_TOUCH,
    resolver: zodResolver(changeFormSchema),
    defaultValues: { currentPassword: '', newPassword: '', repeatPassword: '' },
  });

  const onSubmit = handleSubmit(async ({ currentPassword, newPassword }) => {
    try {
      await change.mutateAsync({ currentPassword, newPassword });
      reset();
      onChanged();
    } catch (error) {
      applyApiError(error, setError, ['currentPassword', 'newPassword']);
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex max-w-sm flex-col gap-4" aria-label="Change password">
      <fieldset disabled={isSubmitting} className="flex flex-col gap-4">
        <TextField label="Current password" type="password" autoComplete="current-password" error={errors.currentPassword?.message} {...register('currentPassword')} />
        <TextField
          label="New password"
          type="password"
          autoComplete="new-password"
          hint={`At least ${PASSWORD_MIN_LENGTH} characters and hard to guess: a phrase of four or more unrelated words works well.`}
          error={errors.newPassword?.message}
          {...register('newPassword')}
        />
        <TextField label="Repeat new password" type="password" autoComplete="new-password" error={errors.repeatPassword?.message} {...register('repeatPassword')} />
      </fieldset>
      <FormError message={errors.root?.server?.message} />
      <div>
        <Button type="submit" variant="primary" busy={isSubmitting}>
          Change password
        </Button>
      </div>
    </form>
  );
}
