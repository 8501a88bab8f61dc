import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { ROLE_LABELS, ROLES } from '@shared/schemas/auth.schema';
import { updateUserSchema, type User } from '@shared/schemas/user.schema';
import { FormActions } from '@/components/form/form-actions';
import { useSaveErrors } from '@/components/form/use-save-errors';
import { FormField } from '@/components/ui/form-field';
import { Input, labelled, Select } from '@/components/ui/input';
import { ReadOnlyValue } from '@/components/ui/read-only-value';
import { useViewer } from '@/lib/viewer';
import { usersQueryOptions } from '../api/get-users';
import { useUpdateUser } from '../api/update-user';
import { assignmentFor, GrowerAssignment, type GrowerOption } from './grower-assignment';

type Values = z.input<typeof updateUserSchema>;

const LABELS = { name: 'Name', role: 'Role', status: 'Status', growerId: 'Grower', growerIds: 'Growers' };

const toValues = (u: User): Values => ({
  name: u.name,
  role: u.role,
  status: u.status === 'invited' ? undefined : u.status,
  growerId: u.growerId,
  growerIds: u.growerIds,
  version: u.version,
});

/** Changes a person's name, role, status and growers. Your own role and status are not offered. */
export function UserEditForm({
  user,
  growers,
  onSaved,
  cancelTo,
}: {
  user: User;
  growers: GrowerOption[];
  onSaved: () => void;
  cancelTo: string;
}) {
  const me = useViewer();
  const self = me.id === user.id;
  const qc = useQueryClient();
  const form = useForm<Values, unknown, z.output<typeof updateUserSchema>>({
    resolver: zodResolver(updateUserSchema),
    defaultValues: toValues(user),
  });
  const update = useUpdateUser();
  const save = useSaveErrors(form, {
    labels: LABELS,
    reload: async () => {
      const users = await qc.fetchQuery({ ...usersQueryOptions(), staleTime: 0 });
      const fresh = users.find((u) => u.id === user.id);
      if (!fresh) throw new Error('This person is no longer in the workspace.');
      return toValues(fresh);
    },
    format: (key, v) =>
      key === 'growerIds' && Array.isArray(v)
        ? v.map((id) => growers.find((g) => g.id === id)?.name ?? id).join(', ') || '(none)'
        : key === 'growerId'
          ? (growers.find((g) => g.id === v)?.name ?? '(none)')
          : String(v ?? '(empty)'),
  });
  const role = useWatch({ control: form.control, name: 'role' });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((v) => {
    save.begin();
    update.mutate(
      { id: user.id, input: { ...v, ...assignmentFor(v.role, v.growerId, v.growerIds) } },
      { onSuccess: onSaved, onError: save.onError },
    );
  });

  return (
    <form onSubmit={onSubmit} noValidate className="max-w-xl space-y-4">
      {save.conflictNotice}
      <FormField label={LABELS.name} error={errors.name?.message}>
        <Input autoComplete="off" {...form.register('name')} />
      </FormField>
      <div className="grid gap-4 sm:grid-cols-2">
        {self ? (
          <ReadOnlyValue
            label={LABELS.role}
            value={ROLE_LABELS[user.role]}
            note="You cannot change your own role."
          />
        ) : (
          <FormField label={LABELS.role} error={errors.role?.message}>
            <Select {...form.register('role')} options={labelled(ROLES, ROLE_LABELS)} />
          </FormField>
        )}
        {user.status === 'invited' ? (
          <ReadOnlyValue
            label={LABELS.status}
            value="Invited"
            note="Waiting for them to choose a password."
          />
        ) : self ? (
          <ReadOnlyValue label={LABELS.status} value="Active" note="You cannot disable yourself." />
        ) : (
          <FormField
            label={LABELS.status}
            error={errors.status?.message}
            hint="A disabled person is signed out at once and cannot sign in."
          >
            <Select {...form.register('status')}>
              <option value="active">Active</option>
              <option value="disabled">Disabled</option>
            </Select>
          </FormField>
        )}
      </div>
      <GrowerAssignment role={role} control={form.control} errors={errors} growers={growers} />
      <FormActions
        submitLabel="Save changes"
        busy={update.isPending}
        cancelTo={cancelTo}
        error={save.formError}
      />
    </form>
  );
}
