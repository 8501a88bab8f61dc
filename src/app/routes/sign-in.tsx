import { useQuery } from '@tanstack/react-query';
import { Navigate, useNavigate, useSearchParams } from 'react-router-dom';
import { AuthLayout } from '@/components/layouts/auth-layout';
import { meQueryOptions } from '@/features/auth/api/get-me';
import { SignInForm } from '@/features/auth/components/sign-in-form';

/** Only paths inside this app: never another site (`//host`) or a scheme. */
export const safeNext = (next: string | null) => (next && next.startsWith('/') && !next.startsWith('//') ? next : '/');

export function Component() {
  const [search] = useSearchParams();
  const next = safeNext(search.get('next'));
  const navigate = useNavigate();
  // Only what is already known: asking the server would log a 401 for everyone who is signed out.
  const me = useQuery({ ...meQueryOptions(), enabled: false });
  if (me.data) return <Navigate to={next} replace />;
  return (
    <AuthLayout title="Sign in" intro="Use the e-mail address your invitation was sent to.">
      <SignInForm onSignedIn={() => navigate(next, { replace: true })} />
    </AuthLayout>
  );
}
