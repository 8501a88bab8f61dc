import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { acceptInvitationSchema, type Me } from '@shared/schemas/auth.schema';
import { Button } from '@/components/ui/button';
import { FormField } from '@/components/ui/form-field';
import { Input } from '@/components/ui/input';
import { Notice } from '@/components/ui/notice';
import { applyApiError } from '@/lib/form-errors';
import { useAcceptInvitation } from '../api/accept-invitation';
import type { Invitation } from '../api/get-invitation';
import { NewPasswordFields, passwordsAgree } from './new-password-fields';

const schema = acceptInvitationSchema.extend({ confirm: z.string() }).refine(...passwordsAgree);

export function AcceptInvitationForm({
  token,
  invitation,
  onAccepted,
}: {
  token: string;
  invitation: Invitation;
  onAccepted: (me: Me) => void;
}) {
  const form = useForm({
    resolver: zodResolver(schema),
    defaultValues: { token, name: invitation.name, password: '', confirm: '' },
  });
  const accept = useAcceptInvitation();
  const [message, setMessage] = useState<string | null>(null);
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(({ token: t, name, password }) => {
    setMessage(null);
    accept.mutate(
      { token: t, name, password },
      {
        onSuccess: onAccepted,
        onError: (e) => setMessage(applyApiError(e, form.setError, ['name', 'password'])),
      },
    );
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 rounded-card border border-ink-line bg-paper px-3 py-2 text-sm">
        <dt className="text-ink-soft">Workspace</dt>
        <dd className="font-medium">{invitation.workspaceName}</dd>
        <dt className="text-ink-soft">E-mail</dt>
        <dd className="font-medium break-all">{invitation.email}</dd>
      </dl>
      {message ? <Notice tone="danger">{message}</Notice> : null}
      <FormField label="Your name" error={errors.name?.message}>
        <Input autoComplete="name" {...form.register('name')} />
      </FormField>
      <NewPasswordFields
        password={form.register('password')}
        confirm={form.register('confirm')}
        passwordError={errors.password?.message}
        confirmError={errors.confirm?.message}
      />
      <Button type="submit" variant="primary" className="w-full" busy={accept.isPending}>
        Join and sign in
      </Button>
    </form>
  );
}
