import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { requestPasswordResetSchema, type RequestPasswordResetInput } from '@shared/schemas/auth.schema';
import { Button } from '@/components/ui/button';
import { FormError, TextField, MESSAGES_AFTER_TOUCH } from '@/components/ui/field';
import { applyApiError } from '@/lib/form-errors';
import { useRequestPasswordReset } from '../api/request-password-reset';

/** Asks for a reset link; shows the server's one sentence, the same for every address. */
export function ForgotPasswordForm() {
  const requestReset = useRequestPasswordReset();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<RequestPasswordResetInput>({ ...MESSAGES_AFTER_TOUCH, resolver: zodResolver(requestPasswordResetSchema), defaultValues: { email: '' } });

  const onSubmit = handleSubmit(async (values) => {
    try {
      await requestReset.mutateAsync(values);
    } catch (error) {
      applyApiError(error, setError, ['email']);
    }
  });

  if (requestReset.isSuccess) {
    return (
      <p role="status" className="rounded-xs border border-paper-line bg-paper-sunk/60 px-4 py-3 text-sm text-ink">
        {requestReset.data.message}
      </p>
    );
  }
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <fieldset disabled={isSubmitting} className="flex flex-col gap-4">
        <TextField label="E-mail" type="email" autoComplete="username" autoFocus error={errors.email?.message} {...register('email')} />
      </fieldset>
      <FormError message={errors.root?.server?.message} />
      <Button type="submit" variant="primary" busy={isSubmitting}>
        Send reset link
      </Button>
    </form>
  );
}
