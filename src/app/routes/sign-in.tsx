import { Link, Navigate, useNavigate, useSearchParams } from 'react-router-dom';
import { LoadingState } from '@/components/ui/states';
import { useSession } from '@/features/auth/api/get-session';
import { SignInForm } from '@/features/auth/components/sign-in-form';
import { AuthLayout } from './auth-layout';

// Only paths inside the app; never another site.
function safeNext(next: string | null): string {
  return next && next.startsWith('/') && !next.startsWith('//') ? next : '/projects';
}

export function SignInRoute() {
  const session = useSession();
  const navigate = useNavigate();
  const [params] = useSearchParams();
  const next = safeNext(params.get('next'));

  if (session.data?.user) return <Navigate to={next} replace />;

  return (
    <AuthLayout title="Sign in" lead="Use the e-mail address your firm’s admin invited.">
      {session.isPending ? <LoadingState /> : <SignInForm onSignedIn={() => navigate(next, { replace: true })} />}
      <p className="mt-4 text-sm text-ink-soft">
        <Link to="/forgot-password" className="font-medium text-accent hover:underline">
          Forgot password?
        </Link>
      </p>
    </AuthLayout>
  );
}
