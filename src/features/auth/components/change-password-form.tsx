import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { changePasswordSchema } from '@shared/schemas/auth.schema';
import { Button } from '@/components/ui/button';
import { FormField } from '@/components/ui/form-field';
import { Input } from '@/components/ui/input';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { applyApiError } from '@/lib/form-errors';
import { useChangePassword } from '../api/change-password';
import { PASSWORD_HINT } from './new-password-fields';

export function ChangePasswordForm() {
  const form = useForm({
    resolver: zodResolver(changePasswordSchema),
    defaultValues: { currentPassword: '', newPassword: '' },
  });
  const change = useChangePassword();
  const [message, setMessage] = useState<string | null>(null);
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    setMessage(null);
    change.reset();
    change.mutate(values, {
      onSuccess: () => form.reset(),
      onError: (e) => {
        if (isApiError(e) && (e.code === 'invalid_credentials' || e.code === 'wrong_password')) {
          form.setError('currentPassword', { type: 'server', message: 'The current password is not right' });
        } else {
          setMessage(applyApiError(e, form.setError, ['currentPassword', 'newPassword']));
        }
      },
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="max-w-sm space-y-4">
      {change.isSuccess ? (
        <Notice tone="ok" title="Password changed">
          Your other sessions have ended; this one stays signed in.
        </Notice>
      ) : null}
      {message ? <Notice tone="danger">{message}</Notice> : null}
      <FormField label="Current password" error={errors.currentPassword?.message}>
        <Input type="password" autoComplete="current-password" {...form.register('currentPassword')} />
      </FormField>
      <FormField label="New password" hint={PASSWORD_HINT} error={errors.newPassword?.message}>
        <Input type="password" autoComplete="new-password" {...form.register('newPassword')} />
      </FormField>
      <Button type="submit" variant="primary" busy={change.isPending}>
        Change password
      </Button>
    </form>
  );
}
