import { useState } from 'react';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { versionSchema } from '@shared/schemas/common.schema';
import { CROP_LABELS, CROPS } from '@shared/schemas/crops';
import { seasonInputSchema, type Season } from '@shared/schemas/season.schema';
import { FormActions } from '@/components/form/form-actions';
import { ReadOnlyValue } from '@/components/ui/read-only-value';
import { FormField } from '@/components/ui/form-field';
import { Input, labelled, Select, Textarea } from '@/components/ui/input';
import { useCreateSeason } from '../api/create-season';
import { useFields } from '../api/get-fields';
import { useGrowers } from '../api/get-growers';
import { getSeason } from '../api/get-season';
import { useUpdateSeason } from '../api/update-season';
import { NarrowByGrower, pickedId, RecordSelect } from './record-select';
import { useRecordForm } from './use-record-form';

const formSchema = seasonInputSchema.extend({
  fieldId: pickedId('field'),
  version: versionSchema.optional(),
});
type Values = z.input<typeof formSchema>;

const LABELS = {
  fieldId: 'Field',
  year: 'Year',
  crop: 'Crop',
  plannedPlantingDate: 'Planned planting date',
  notes: 'Notes',
};

const toValues = (s: Season | undefined, fieldId: string): Values => ({
  fieldId: s?.fieldId ?? fieldId,
  year: s?.year ?? new Date().getFullYear(),
  crop: s?.crop ?? ('' as Values['crop']),
  plannedPlantingDate: s?.plannedPlantingDate ?? '',
  notes: s?.notes ?? '',
  version: s?.version,
});

/** Adds a crop season to a field, or edits one. A season stays with its field. */
export function SeasonForm({
  season,
  growerId: initialGrowerId = '',
  fieldId = '',
  onSaved,
  cancelTo,
}: {
  season?: Season;
  growerId?: string;
  fieldId?: string;
  onSaved: (s: Season) => void;
  cancelTo: string;
}) {
  const [growerId, setGrowerId] = useState(initialGrowerId);
  const growers = useGrowers();
  const fields = useFields(growerId ? { growerId } : {});
  const { form, save } = useRecordForm({
    record: season,
    resolver: zodResolver(formSchema),
    toValues: (s?: Season) => toValues(s, fieldId),
    fetchRecord: getSeason,
    labels: LABELS,
    format: (key, v) =>
      key === 'crop' && typeof v === 'string' && v in CROP_LABELS
        ? CROP_LABELS[v as keyof typeof CROP_LABELS]
        : String(v ?? '') || '(empty)',
  });
  const create = useCreateSeason();
  const update = useUpdateSeason();
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(({ version, fieldId: fid, ...rest }) => {
    save.begin();
    if (season) {
      update.mutate(
        { id: season.id, input: { ...rest, version: version ?? season.version } },
        { onSuccess: onSaved, onError: save.onError },
      );
    } else {
      create.mutate({ fieldId: fid, ...rest }, { onSuccess: onSaved, onError: save.onError });
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="max-w-xl space-y-4">
      {save.conflictNotice}
      {season ? (
        <ReadOnlyValue
          label="Field"
          value={`${season.fieldName} (${season.farmName}, ${season.growerName})`}
          note="A crop season stays with its field."
        />
      ) : (
        <div className="grid gap-4 sm:grid-cols-2">
          <NarrowByGrower
            growers={growers.data ?? []}
            value={growerId}
            narrows="fields"
            onChange={(id) => {
              setGrowerId(id);
              form.setValue('fieldId', '');
            }}
          />
          <RecordSelect
            label={LABELS.fieldId}
            placeholder="Choose a field"
            loading={fields.isPending}
            options={(fields.data ?? []).map((f) => ({
              id: f.id,
              name: f.name,
              detail: growerId ? f.farmName : `${f.farmName}, ${f.growerName}`,
            }))}
            registration={form.register('fieldId')}
            error={errors.fieldId?.message}
          />
        </div>
      )}
      <div className="grid gap-4 sm:grid-cols-3">
        <FormField label={LABELS.year} error={errors.year?.message}>
          <Input
            type="number"
            step={1}
            min={1990}
            max={2100}
            {...form.register('year', { valueAsNumber: true })}
          />
        </FormField>
        <FormField label={LABELS.crop} error={errors.crop?.message}>
          <Select
            {...form.register('crop')}
            placeholder="Choose a crop"
            options={labelled(CROPS, CROP_LABELS)}
          />
        </FormField>
        <FormField label={LABELS.plannedPlantingDate} error={errors.plannedPlantingDate?.message}>
          <Input
            type="date"
            {...form.register('plannedPlantingDate', { setValueAs: (v: string) => v || null })}
          />
        </FormField>
      </div>
      <FormField label={LABELS.notes} error={errors.notes?.message}>
        <Textarea {...form.register('notes')} />
      </FormField>
      <FormActions
        submitLabel={season ? 'Save changes' : 'Add crop season'}
        busy={create.isPending || update.isPending}
        cancelTo={cancelTo}
        error={save.formError}
      />
    </form>
  );
}
