import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { ROLE_LABELS, ROLES } from '@shared/schemas/auth.schema';
import { inviteUserSchema, type User } from '@shared/schemas/user.schema';
import { FormActions } from '@/components/form/form-actions';
import { useSaveErrors } from '@/components/form/use-save-errors';
import { FormField } from '@/components/ui/form-field';
import { Input, labelled, Select } from '@/components/ui/input';
import { useInviteUser } from '../api/invite-user';
import { assignmentFor, GrowerAssignment, type GrowerOption } from './grower-assignment';

type Values = z.input<typeof inviteUserSchema>;
const LABELS = { name: 'Name', email: 'E-mail', role: 'Role', growerId: 'Grower', growerIds: 'Growers' };

/** Invites a person by e-mail with one role. */
export function InviteForm({
  growers,
  onInvited,
  cancelTo,
}: {
  growers: GrowerOption[];
  onInvited: (u: User) => void;
  cancelTo: string;
}) {
  const form = useForm<Values, unknown, z.output<typeof inviteUserSchema>>({
    resolver: zodResolver(inviteUserSchema),
    defaultValues: { name: '', email: '', role: 'agronomist', growerId: null, growerIds: [] },
  });
  const invite = useInviteUser();
  const save = useSaveErrors(form, { labels: LABELS });
  const role = useWatch({ control: form.control, name: 'role' });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((v) => {
    save.begin();
    invite.mutate(
      { ...v, ...assignmentFor(v.role, v.growerId, v.growerIds) },
      { onSuccess: onInvited, onError: save.onError },
    );
  });

  return (
    <form onSubmit={onSubmit} noValidate className="max-w-xl space-y-4">
      <div className="grid gap-4 sm:grid-cols-2">
        <FormField label={LABELS.name} error={errors.name?.message}>
          <Input autoComplete="off" {...form.register('name')} />
        </FormField>
        <FormField label={LABELS.email} error={errors.email?.message}>
          <Input type="email" autoComplete="off" {...form.register('email')} />
        </FormField>
      </div>
      <FormField label={LABELS.role} error={errors.role?.message} className="sm:w-1/2">
        <Select {...form.register('role')} options={labelled(ROLES, ROLE_LABELS)} />
      </FormField>
      <GrowerAssignment role={role} control={form.control} errors={errors} growers={growers} />
      <FormActions
        submitLabel="Send invitation"
        busy={invite.isPending}
        cancelTo={cancelTo}
        error={save.formError}
      />
    </form>
  );
}
