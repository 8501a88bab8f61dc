import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'react-router-dom';
import { z } from 'zod';
import { tokenPasswordSchema } from '@shared/schemas/auth.schema';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { applyApiError } from '@/lib/form-errors';
import { useResetPassword } from '../api/reset-password';
import { NewPasswordFields, passwordsAgree } from './new-password-fields';

const schema = tokenPasswordSchema.extend({ confirm: z.string() }).refine(...passwordsAgree);

export function ResetPasswordForm({ token }: { token: string }) {
  const form = useForm({
    resolver: zodResolver(schema),
    defaultValues: { token, password: '', confirm: '' },
  });
  const reset = useResetPassword();
  const [message, setMessage] = useState<string | null>(null);
  const [done, setDone] = useState(false);

  const onSubmit = form.handleSubmit(({ token: t, password }) => {
    setMessage(null);
    reset.mutate(
      { token: t, password },
      {
        onSuccess: () => setDone(true),
        onError: (e) => {
          if (isApiError(e) && (e.status === 404 || e.status === 410 || e.code === 'invalid_token')) {
            setMessage('This link is no longer valid: it was used, replaced by a newer one, or has expired.');
          } else {
            setMessage(applyApiError(e, form.setError, ['password']));
          }
        },
      },
    );
  });

  if (done) {
    return (
      <Notice tone="ok" title="Password changed">
        Your new password is set and every earlier session has ended.{' '}
        <Link to="/sign-in" className="font-medium text-clay-700 underline">
          Sign in
        </Link>
      </Notice>
    );
  }
  const tokenError = form.formState.errors.token?.message;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {message || tokenError ? (
        <Notice tone="danger">
          {message ?? tokenError}{' '}
          <Link to="/forgot-password" className="font-medium text-clay-700 underline">
            Ask for a new link
          </Link>
        </Notice>
      ) : null}
      <NewPasswordFields
        password={form.register('password')}
        confirm={form.register('confirm')}
        passwordError={form.formState.errors.password?.message}
        confirmError={form.formState.errors.confirm?.message}
      />
      <Button type="submit" variant="primary" className="w-full" busy={reset.isPending}>
        Set new password
      </Button>
    </form>
  );
}
