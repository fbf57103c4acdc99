import { Link, useNavigate, useParams } from 'react-router-dom';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { useInvitation } from '@/features/auth/api/get-invitation';
import { AcceptInvitationForm } from '@/features/auth/components/accept-invitation-form';
import { ApiError } from '@/lib/api-client';
import { AuthLayout } from './auth-layout';

const DEAD_INVITATION_TITLES: Record<string, string> = {
  'invitation-not-found': 'This invitation link is not known',
  'invitation-used': 'This invitation has been used',
  'invitation-expired': 'This invitation has expired',
};

export function AcceptInvitationRoute() {
  const { token = '' } = useParams();
  const invitation = useInvitation(token);
  const navigate = useNavigate();

  if (invitation.isPending) {
    return (
      <AuthLayout title="Join your firm on Panelpoint">
        <LoadingState label="Reading the invitation…" />
      </AuthLayout>
    );
  }
  if (invitation.isError) {
    const code = invitation.error instanceof ApiError ? invitation.error.code : '';
    return (
      <AuthLayout title="Join your firm on Panelpoint">
        <ErrorState title={DEAD_INVITATION_TITLES[code] ?? 'The invitation could not be read'} error={invitation.error} />
        <p className="text-sm text-ink-soft">
          Ask your firm’s admin for a new invitation, or{' '}
          <Link to="/sign-in" className="font-medium text-accent hover:underline">
            sign in
          </Link>{' '}
          if you already have an account.
        </p>
      </AuthLayout>
    );
  }
  return (
    <AuthLayout title="Join your firm on Panelpoint" lead="Choose the name shown on your sheets and a password.">
      <AcceptInvitationForm token={token} invitation={invitation.data} onAccepted={() => navigate('/projects', { replace: true })} />
    </AuthLayout>
  );
}
