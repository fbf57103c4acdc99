import { Link, useNavigate, useParams } from 'react-router-dom';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { usePasswordReset } from '@/features/auth/api/get-password-reset';
import { ResetPasswordForm } from '@/features/auth/components/reset-password-form';
import { ApiError } from '@/lib/api-client';
import { AuthLayout } from './auth-layout';

const DEAD_LINK_TITLES: Record<string, string> = {
  'reset-not-found': 'This reset link is not known',
  'reset-used': 'This reset link has been used',
  'reset-expired': 'This reset link has expired',
};

export function ResetPasswordRoute() {
  const { token = '' } = useParams();
  const reset = usePasswordReset(token);
  const navigate = useNavigate();

  if (reset.isPending) {
    return (
      <AuthLayout title="Choose a new password">
        <LoadingState label="Reading the link…" />
      </AuthLayout>
    );
  }
  if (reset.isError) {
    const code = reset.error instanceof ApiError ? reset.error.code : '';
    return (
      <AuthLayout title="Choose a new password">
        <ErrorState title={DEAD_LINK_TITLES[code] ?? 'The reset link could not be read'} error={reset.error} />
        <p className="text-sm text-ink-soft">
          <Link to="/forgot-password" className="font-medium text-accent hover:underline">
            Ask for a new link
          </Link>{' '}
          or{' '}
          <Link to="/sign-in" className="font-medium text-accent hover:underline">
            sign in
          </Link>
          .
        </p>
      </AuthLayout>
    );
  }
  return (
    <AuthLayout title="Choose a new password" lead="This signs you out everywhere else and signs you in here.">
      <ResetPasswordForm token={token} reset={reset.data} onDone={() => navigate('/projects', { replace: true })} />
    </AuthLayout>
  );
}
