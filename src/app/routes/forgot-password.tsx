import { Link } from 'react-router-dom';
import { ForgotPasswordForm } from '@/features/auth/components/forgot-password-form';
import { AuthLayout } from './auth-layout';

export function ForgotPasswordRoute() {
  return (
    <AuthLayout title="Forgot your password?" lead="Enter the e-mail address you sign in with; we send a link to choose a new password.">
      <ForgotPasswordForm />
      <p className="mt-4 text-sm text-ink-soft">
        <Link to="/sign-in" className="font-medium text-accent hover:underline">
          Back to sign in
        </Link>
      </p>
    </AuthLayout>
  );
}
