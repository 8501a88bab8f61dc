import { Link } from 'react-router-dom';
import { AuthLayout } from '@/components/layouts/auth-layout';
import { ForgotPasswordForm } from '@/features/auth/components/forgot-password-form';

export function Component() {
  return (
    <AuthLayout title="Forgot password" intro="We will e-mail you a link to choose a new password.">
      <ForgotPasswordForm />
      <p className="mt-4 text-center text-sm">
        <Link to="/sign-in" className="text-clay-700 underline-offset-2 hover:underline">
          Back to sign-in
        </Link>
      </p>
    </AuthLayout>
  );
}
