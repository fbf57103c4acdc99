import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { signInSchema, type SessionView, type SignInInput } from '@shared/schemas/auth.schema';
import { Button } from '@/components/ui/button';
import { FormError, TextField, MESSAGES_AFTER_TOUCH } from '@/components/ui/field';
import { applyApiError } from '@/lib/form-errors';
import { useSignIn } from '../api/sign-in';

export function SignInForm({ onSignedIn }: { onSignedIn: (session: SessionView) => void }) {
  const signIn = useSignIn();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<SignInInput>({ ...MESSAGES_AFTER_TOUCH, resolver: zodResolver(signInSchema), defaultValues: { email: '', password: '' } });

  const onSubmit = handleSubmit(async (values) => {
    try {
      onSignedIn(await signIn.mutateAsync(values));
    } catch (error) {
      applyApiError(error, setError, ['email', 'password']);
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <fieldset disabled={isSubmitting} className="flex flex-col gap-4">
        <TextField label="E-mail" type="email" autoComplete="username" autoFocus error={errors.email?.message} {...register('email')} />
        <TextField label="Password" type="password" autoComplete="current-password" error={errors.password?.message} {...register('password')} />
      </fieldset>
      <FormError message={errors.root?.server?.message} />
      <Button type="submit" variant="primary" busy={isSubmitting}>
        Sign in
      </Button>
    </form>
  );
}
