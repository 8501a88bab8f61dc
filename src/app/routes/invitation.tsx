import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { AuthLayout } from '@/components/layouts/auth-layout';
import { Loading } from '@/components/ui/loading';
import { Notice } from '@/components/ui/notice';
import { describeError } from '@/components/ui/query-state';
import { useInvitation } from '@/features/auth/api/get-invitation';
import { AcceptInvitationForm } from '@/features/auth/components/accept-invitation-form';
import { isApiError } from '@/lib/api-client';

export function Component() {
  const [search] = useSearchParams();
  const token = search.get('token') ?? '';
  const navigate = useNavigate();
  const invitation = useInvitation(token);

  const body = !token ? (
    <Notice tone="danger" title="This link is incomplete">
      Open the link from the invitation e-mail again.
    </Notice>
  ) : invitation.isPending ? (
    <Loading label="Checking the invitation…" />
  ) : invitation.isError ? (
    <Notice tone="danger" title="This invitation cannot be used">
      {isApiError(invitation.error) && invitation.error.status === 404
        ? 'It was already accepted, replaced by a newer one, or has expired. Ask the admin who invited you to send it again.'
        : describeError(invitation.error)}{' '}
      <Link to="/sign-in" className="font-medium text-clay-700 underline">
        Sign in
      </Link>
    </Notice>
  ) : (
    <AcceptInvitationForm
      token={token}
      invitation={invitation.data}
      onAccepted={() => navigate('/', { replace: true })}
    />
  );

  return (
    <AuthLayout
      title="Join your team on Sowright"
      intro="Choose a password to finish setting up your account."
    >
      {body}
    </AuthLayout>
  );
}
