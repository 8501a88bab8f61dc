import { Link, useSearchParams } from 'react-router-dom';
import { AuthLayout } from '@/components/layouts/auth-layout';
import { Notice } from '@/components/ui/notice';
import { ResetPasswordForm } from '@/features/auth/components/reset-password-form';

export function Component() {
  const [search] = useSearchParams();
  const token = search.get('token') ?? '';
  return (
    <AuthLayout title="Choose a new password">
      {token ? (
        <ResetPasswordForm token={token} />
      ) : (
        <Notice tone="danger" title="This link is incomplete">
          Open the link from the e-mail again, or{' '}
          <Link to="/forgot-password" className="font-medium text-clay-700 underline">
            ask for a new one
          </Link>
          .
        </Notice>
      )}
    </AuthLayout>
  );
}
