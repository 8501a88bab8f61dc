import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { versionSchema } from '@shared/schemas/common.schema';
import { farmInputSchema, type Farm } from '@shared/schemas/farm.schema';
import { FormActions } from '@/components/form/form-actions';
import { ReadOnlyValue } from '@/components/ui/read-only-value';
import { FormField } from '@/components/ui/form-field';
import { Input, Textarea } from '@/components/ui/input';
import { useCreateFarm } from '../api/create-farm';
import { getFarm } from '../api/get-farm';
import { useGrowers } from '../api/get-growers';
import { useUpdateFarm } from '../api/update-farm';
import { pickedId, RecordSelect } from './record-select';
import { useRecordForm } from './use-record-form';

const formSchema = farmInputSchema.extend({
  growerId: pickedId('grower'),
  version: versionSchema.optional(),
});
type Values = z.input<typeof formSchema>;

const LABELS = { growerId: 'Grower', name: 'Name', notes: 'Notes' };

const toValues = (f: Farm | undefined, growerId: string): Values => ({
  growerId: f?.growerId ?? growerId,
  name: f?.name ?? '',
  notes: f?.notes ?? '',
  version: f?.version,
});

/** Adds a farm to a grower, or renames one. A farm stays with its grower. */
export function FarmForm({
  farm,
  growerId = '',
  onSaved,
  cancelTo,
}: {
  farm?: Farm;
  growerId?: string;
  onSaved: (f: Farm) => void;
  cancelTo: string;
}) {
  const growers = useGrowers();
  const { form, save } = useRecordForm({
    record: farm,
    resolver: zodResolver(formSchema),
    toValues: (f?: Farm) => toValues(f, growerId),
    fetchRecord: getFarm,
    labels: LABELS,
  });
  const create = useCreateFarm();
  const update = useUpdateFarm();
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(({ version, growerId: gid, ...rest }) => {
    save.begin();
    if (farm) {
      update.mutate(
        { id: farm.id, input: { ...rest, version: version ?? farm.version } },
        { onSuccess: onSaved, onError: save.onError },
      );
    } else {
      create.mutate({ growerId: gid, ...rest }, { onSuccess: onSaved, onError: save.onError });
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="max-w-xl space-y-4">
      {save.conflictNotice}
      {farm ? (
        <ReadOnlyValue
          label="Grower"
          value={farm.growerName}
          note="A farm stays with the grower it was added to."
        />
      ) : (
        <RecordSelect
          label={LABELS.growerId}
          placeholder="Choose a grower"
          loading={growers.isPending}
          options={growers.data ?? []}
          registration={form.register('growerId')}
          error={errors.growerId?.message}
        />
      )}
      <FormField label={LABELS.name} error={errors.name?.message}>
        <Input autoFocus={!!farm} {...form.register('name')} />
      </FormField>
      <FormField label={LABELS.notes} error={errors.notes?.message}>
        <Textarea {...form.register('notes')} />
      </FormField>
      <FormActions
        submitLabel={farm ? 'Save changes' : 'Add farm'}
        busy={create.isPending || update.isPending}
        cancelTo={cancelTo}
        error={save.formError}
      />
    </form>
  );
}
