import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { versionSchema } from '@shared/schemas/common.schema';
import { growerInputSchema, type Grower } from '@shared/schemas/grower.schema';
import { FormActions } from '@/components/form/form-actions';
import { FormField } from '@/components/ui/form-field';
import { Input, Textarea } from '@/components/ui/input';
import { useCreateGrower } from '../api/create-grower';
import { getGrower } from '../api/get-grower';
import { useUpdateGrower } from '../api/update-grower';
import { useRecordForm } from './use-record-form';

const formSchema = growerInputSchema.extend({ version: versionSchema.optional() });
type Values = z.input<typeof formSchema>;

const LABELS = {
  name: 'Name',
  contactName: 'Contact person',
  email: 'E-mail',
  phone: 'Phone',
  notes: 'Notes',
};

const toValues = (g?: Grower): Values => ({
  name: g?.name ?? '',
  contactName: g?.contactName ?? '',
  email: g?.email ?? '',
  phone: g?.phone ?? '',
  notes: g?.notes ?? '',
  version: g?.version,
});

/** Adds a grower, or edits one when `grower` is given. */
export function GrowerForm({
  grower,
  onSaved,
  cancelTo,
}: {
  grower?: Grower;
  onSaved: (g: Grower) => void;
  cancelTo: string;
}) {
  const { form, save } = useRecordForm({
    record: grower,
    resolver: zodResolver(formSchema),
    toValues,
    fetchRecord: getGrower,
    labels: LABELS,
  });
  const create = useCreateGrower();
  const update = useUpdateGrower();
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(({ version, ...input }) => {
    save.begin();
    if (grower) {
      update.mutate(
        { id: grower.id, input: { ...input, version: version ?? grower.version } },
        { onSuccess: onSaved, onError: save.onError },
      );
    } else {
      create.mutate(input, { onSuccess: onSaved, onError: save.onError });
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="max-w-xl space-y-4">
      {save.conflictNotice}
      <FormField label={LABELS.name} error={errors.name?.message}>
        <Input autoFocus {...form.register('name')} />
      </FormField>
      <div className="grid gap-4 sm:grid-cols-2">
        <FormField label={LABELS.contactName} error={errors.contactName?.message}>
          <Input autoComplete="off" {...form.register('contactName')} />
        </FormField>
        <FormField label={LABELS.phone} error={errors.phone?.message}>
          <Input type="tel" autoComplete="off" {...form.register('phone')} />
        </FormField>
      </div>
      <FormField label={LABELS.email} error={errors.email?.message}>
        <Input type="email" autoComplete="off" {...form.register('email')} />
      </FormField>
      <FormField label={LABELS.notes} error={errors.notes?.message}>
        <Textarea {...form.register('notes')} />
      </FormField>
      <FormActions
        submitLabel={grower ? 'Save changes' : 'Add grower'}
        busy={create.isPending || update.isPending}
        cancelTo={cancelTo}
        error={save.formError}
      />
    </form>
  );
}
