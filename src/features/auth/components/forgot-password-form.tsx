import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { requestResetSchema } from '@shared/schemas/auth.schema';
import { Button } from '@/components/ui/button';
import { FormField } from '@/components/ui/form-field';
import { Input } from '@/components/ui/input';
import { Notice } from '@/components/ui/notice';
import { describeError } from '@/components/ui/query-state';
import { useRequestReset } from '../api/request-reset';

export function ForgotPasswordForm() {
  const form = useForm({ resolver: zodResolver(requestResetSchema), defaultValues: { email: '' } });
  const request = useRequestReset();
  const [sentTo, setSentTo] = useState<string | null>(null);

  const onSubmit = form.handleSubmit((values) =>
    request.mutate(values, { onSuccess: () => setSentTo(values.email) }),
  );

  if (sentTo) {
    return (
      <Notice tone="ok" title="Check your e-mail">
        If an account exists for <span className="font-medium text-ink">{sentTo}</span>, a link to choose a
        new password is on its way. The link works once and expires soon.
      </Notice>
    );
  }
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {request.isError ? <Notice tone="danger">{describeError(request.error)}</Notice> : null}
      <FormField label="E-mail" error={form.formState.errors.email?.message}>
        <Input type="email" autoComplete="username" autoFocus {...form.register('email')} />
      </FormField>
      <Button type="submit" variant="primary" className="w-full" busy={request.isPending}>
        Send me a link
      </Button>
    </form>
  );
}
