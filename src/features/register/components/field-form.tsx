import { useState } from 'react';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { versionSchema } from '@shared/schemas/common.schema';
import { fieldInputSchema, type Field } from '@shared/schemas/field.schema';
import { FormActions } from '@/components/form/form-actions';
import { ReadOnlyValue } from '@/components/ui/read-only-value';
import { FormField } from '@/components/ui/form-field';
import { Input, Textarea } from '@/components/ui/input';
import { useCreateField } from '../api/create-field';
import { useFarms } from '../api/get-farms';
import { getField } from '../api/get-field';
import { useGrowers } from '../api/get-growers';
import { useUpdateField } from '../api/update-field';
import { NarrowByGrower, pickedId, RecordSelect } from './record-select';
import { useRecordForm } from './use-record-form';

/** The boundary is not edited here: it has its own import on the field's page. */
const formSchema = fieldInputSchema.omit({ boundary: true }).extend({
  farmId: pickedId('farm'),
  version: versionSchema.optional(),
});
type Values = z.input<typeof formSchema>;

const LABELS = { farmId: 'Farm', name: 'Name', notes: 'Notes' };

const toValues = (f: Field | undefined, farmId: string): Values => ({
  farmId: f?.farmId ?? farmId,
  name: f?.name ?? '',
  notes: f?.notes ?? '',
  version: f?.version,
});

/** Adds a field to a farm, or renames one. A field stays on its farm. */
export function FieldForm({
  field,
  growerId: initialGrowerId = '',
  farmId = '',
  onSaved,
  cancelTo,
}: {
  field?: Field;
  growerId?: string;
  farmId?: string;
  onSaved: (f: Field) => void;
  cancelTo: string;
}) {
  const [growerId, setGrowerId] = useState(initialGrowerId);
  const growers = useGrowers();
  const farms = useFarms(growerId ? { growerId } : {});
  const { form, save } = useRecordForm({
    record: field,
    resolver: zodResolver(formSchema),
    toValues: (f?: Field) => toValues(f, farmId),
    fetchRecord: getField,
    labels: LABELS,
  });
  const create = useCreateField();
  const update = useUpdateField();
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(({ version, farmId: fid, ...rest }) => {
    save.begin();
    if (field) {
      update.mutate(
        { id: field.id, input: { ...rest, version: version ?? field.version } },
        { onSuccess: onSaved, onError: save.onError },
      );
    } else {
      create.mutate({ farmId: fid, ...rest }, { onSuccess: onSaved, onError: save.onError });
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="max-w-xl space-y-4">
      {save.conflictNotice}
      {field ? (
        <ReadOnlyValue
          label="Farm"
          value={`${field.farmName} (${field.growerName})`}
          note="A field stays on the farm it was added to."
        />
      ) : (
        <div className="grid gap-4 sm:grid-cols-2">
          <NarrowByGrower
            growers={growers.data ?? []}
            value={growerId}
            narrows="farms"
            onChange={(id) => {
              setGrowerId(id);
              form.setValue('farmId', '');
            }}
          />
          <RecordSelect
            label={LABELS.farmId}
            placeholder="Choose a farm"
            loading={farms.isPending}
            options={(farms.data ?? []).map((f) => ({
              id: f.id,
              name: f.name,
              detail: growerId ? undefined : f.growerName,
            }))}
            registration={form.register('farmId')}
            error={errors.farmId?.message}
          />
        </div>
      )}
      <FormField label={LABELS.name} error={errors.name?.message}>
        <Input autoFocus={!!field} {...form.register('name')} />
      </FormField>
      <FormField label={LABELS.notes} error={errors.notes?.message}>
        <Textarea {...form.register('notes')} />
      </FormField>
      <FormActions
        submitLabel={field ? 'Save changes' : 'Add field'}
        busy={create.isPending || update.isPending}
        cancelTo={cancelTo}
        error={save.formError}
      />
    </form>
  );
}
