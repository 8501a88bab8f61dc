import { Navigate, useNavigate, useSearchParams } from 'react-router-dom';
import { AuthLayout } from '@/components/layouts/auth-layout';
import { Loading } from '@/components/ui/loading';
import { useMe } from '@/features/auth/api/get-me';
import { SignInForm } from '@/features/auth/components/sign-in-form';

/** Only paths inside this app: never another site (`//host`) or a scheme. */
export const safeNext = (next: string | null) =>
  next && next.startsWith('/') && !next.startsWith('//') ? next : '/';

export function Component() {
  const [search] = useSearchParams();
  const next = safeNext(search.get('next'));
  const navigate = useNavigate();
  const me = useMe();
  if (me.isPending) return <Loading />;
  if (me.data) return <Navigate to={next} replace />;
  return (
    <AuthLayout title="Sign in" intro="Use the e-mail address your invitation was sent to.">
      <SignInForm onSignedIn={() => navigate(next, { replace: true })} />
    </AuthLayout>
  );
}
