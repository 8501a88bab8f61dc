import { useFieldArray, useWatch, type FieldErrors, type Resolver } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { CROP_LABELS, CROPS } from '@shared/schemas/crops';
import {
  ARRANGEMENT_LABELS,
  ARRANGEMENTS,
  GROUND_SPEED_SOURCE_LABELS,
  GROUND_SPEED_SOURCES,
  planterInputSchema,
  type Planter,
} from '@shared/schemas/planter.schema';
import { lengthUnitLabel, speedUnitLabel, type UnitSystem } from '@shared/units';
import { FormActions, FormSection } from '@/components/form/form-actions';
import { ReadOnlyValue } from '@/components/ui/read-only-value';
import { Button } from '@/components/ui/button';
import { FormField } from '@/components/ui/form-field';
import { Input, labelled, Select, Textarea } from '@/components/ui/input';
import { Notice } from '@/components/ui/notice';
import { canEditRegister } from '@/lib/permissions';
import { useUnitSystem, useViewer } from '@/lib/viewer';
import { useCreatePlanter } from '../api/create-planter';
import { useGrowers } from '../api/get-growers';
import { getPlanter } from '../api/get-planter';
import { useUpdatePlanter } from '../api/update-planter';
import { formToSi, messageInUserUnits, planterToForm, type PlanterFormValues } from './planter-values';
import { RecordSelect } from './record-select';
import { SectionLine } from './section-line';
import { useRecordForm } from './use-record-form';

type PlanterOut = z.output<typeof planterInputSchema>;

const LABELS: Record<string, string> = {
  growerId: 'Grower',
  name: 'Name',
  rowCount: 'Rows',
  rowSpacingM: 'Row spacing',
  arrangement: 'Row arrangement',
  interplantRowCount: 'Interplant rows',
  rowsPerSection: 'Rows per section',
  displaySectionLimit: 'Sections the display controls',
  holesPerDisc: 'Holes per disc',
  discRpmMin: 'Lowest disc speed',
  discRpmMax: 'Highest disc speed',
  speedMinMps: 'Lowest planting speed',
  speedPlannedMps: 'Planned speed',
  speedMaxMps: 'Highest planting speed',
  groundSpeedSource: 'Ground speed from',
  notes: 'Notes',
};

/** Validates with the shared schema after converting the user's units to SI; limits are told back in their units. */
function planterResolver(
  system: UnitSystem,
  saved?: Planter,
): Resolver<PlanterFormValues, unknown, PlanterOut> {
  const inner = zodResolver(planterInputSchema);
  return async (values, context, options) => {
    const result = await inner(
      formToSi(values, system, saved),
      context,
      options as unknown as Parameters<typeof inner>[2],
    );
    if (Object.keys(result.errors).length === 0) return { values: result.values as PlanterOut, errors: {} };
    const errors = { ...result.errors } as Record<string, { message?: string; type?: string }>;
    if (!values.growerId) errors.growerId = { type: 'required', message: 'Choose a grower' };
    for (const [key, err] of Object.entries(errors)) {
      if (err?.message) errors[key] = { ...err, message: messageInUserUnits(key, err.message, system) };
    }
    return { values: {}, errors: errors as FieldErrors<PlanterFormValues> };
  };
}

type NumberKey =
  | 'rowCount'
  | 'rowSpacingM'
  | 'interplantRowCount'
  | 'rowsPerSection'
  | 'displaySectionLimit'
  | 'discRpmMin'
  | 'discRpmMax'
  | 'speedMinMps'
  | 'speedPlannedMps'
  | 'speedMaxMps';

/** Adds a planter profile, or edits one. Row spacing and speeds are typed in the user's units. */
export function PlanterForm({
  planter,
  growerId = '',
  onSaved,
  cancelTo,
}: {
  planter?: Planter;
  growerId?: string;
  onSaved: (p: Planter) => void;
  cancelTo: string;
}) {
  const me = useViewer();
  const system = useUnitSystem();
  const pickGrower = !planter && canEditRegister(me);
  const growers = useGrowers();
  const fixedGrowerId = planter?.growerId ?? (pickGrower ? growerId : (me.growerId ?? ''));
  const { form, save } = useRecordForm({
    record: planter,
    resolver: planterResolver(system, planter),
    toValues: (p?: Planter) => planterToForm(p, system, fixedGrowerId),
    fetchRecord: getPlanter,
    labels: LABELS,
    format: (key, v) =>
      key === 'holesPerDisc' && Array.isArray(v)
        ? v
            .map(
              (h: { crop: string; holes: number }) =>
                `${CROP_LABELS[h.crop as keyof typeof CROP_LABELS] ?? h.crop} ${h.holes}`,
            )
            .join(', ')
        : v === null || v === undefined || v === '' || Number.isNaN(v)
          ? '(empty)'
          : String(v),
  });
  const holes = useFieldArray({ control: form.control, name: 'holesPerDisc' });
  const create = useCreatePlanter();
  const update = useUpdatePlanter();
  const [arrangement, rowCount, rowsPerSection, displaySectionLimit, holesList] = useWatch({
    control: form.control,
    name: ['arrangement', 'rowCount', 'rowsPerSection', 'displaySectionLimit', 'holesPerDisc'],
  });
  const { errors } = form.formState;
  const err = (key: keyof PlanterFormValues) => (errors[key] as { message?: string } | undefined)?.message;
  /** A number input under the API's key, with its label, unit and error. */
  const numberField = (key: NumberKey, opts: { unit?: string; hint?: string } = {}) => (
    <FormField label={LABELS[key]} unit={opts.unit} hint={opts.hint} error={err(key)}>
      <Input type="number" min={0} {...form.register(key, { valueAsNumber: true })} />
    </FormField>
  );
  const lengthUnit = lengthUnitLabel(system);
  const speedUnit = speedUnitLabel(system);

  const onSubmit = form.handleSubmit(({ growerId: gid, ...rest }) => {
    save.begin();
    const onError = (e: unknown) => {
      save.onError(e);
      // The server states limits in SI; say them in the user's units.
      for (const key of ['rowSpacingM', 'speedMinMps', 'speedPlannedMps', 'speedMaxMps'] as const) {
        const m = form.getFieldState(key).error?.message;
        if (m) form.setError(key, { type: 'server', message: messageInUserUnits(key, m, system) });
      }
    };
    if (planter) {
      const version = form.getValues('version') ?? planter.version;
      update.mutate({ id: planter.id, input: { ...rest, version } }, { onSuccess: onSaved, onError });
    } else {
      create.mutate({ growerId: gid, ...rest }, { onSuccess: onSaved, onError });
    }
  });

  const usedCrops = new Set((holesList ?? []).map((h) => h.crop));
  const nextCrop = CROPS.find((c) => !usedCrops.has(c));
  const holesError = errors.holesPerDisc?.message ?? errors.holesPerDisc?.root?.message;

  return (
    <form onSubmit={onSubmit} noValidate className="max-w-4xl space-y-5">
      {save.conflictNotice}
      <div className="grid gap-4 sm:grid-cols-2">
        {pickGrower ? (
          <RecordSelect
            label={LABELS.growerId}
            placeholder="Choose a grower"
            loading={growers.isPending}
            options={growers.data ?? []}
            registration={form.register('growerId')}
            error={err('growerId')}
          />
        ) : (
          <ReadOnlyValue
            label="Grower"
            value={planter?.growerName ?? growers.data?.find((g) => g.id === fixedGrowerId)?.name ?? '…'}
            note="A planter stays with its grower."
          />
        )}
        <FormField label={LABELS.name} error={err('name')}>
          <Input {...form.register('name')} />
        </FormField>
      </div>

      <FormSection title="Rows and sections">
        <div className="grid gap-4 sm:grid-cols-3">
          {numberField('rowCount', {
            hint: arrangement === 'split-row' ? 'Count every row unit, interplant rows included.' : undefined,
          })}
          {numberField('rowSpacingM', { unit: lengthUnit })}
          <FormField label={LABELS.arrangement} error={err('arrangement')}>
            <Select {...form.register('arrangement')} options={labelled(ARRANGEMENTS, ARRANGEMENT_LABELS)} />
          </FormField>
          {arrangement === 'split-row'
            ? numberField('interplantRowCount', { hint: 'The rows that fill in between the others.' })
            : null}
          {numberField('rowsPerSection')}
          {numberField('displaySectionLimit', { hint: 'The most sections the display can switch.' })}
        </div>
        <SectionLine rows={rowCount} perSection={rowsPerSection} limit={displaySectionLimit} />
      </FormSection>

      <FormSection
        title="Seed meter"
        description="Holes in the seed disc for each crop the planter sows, and the disc speeds the meter works between."
      >
        <div role="group" aria-label={LABELS.holesPerDisc} className="space-y-2">
          {holes.fields.map((item, i) => (
            <div key={item.id} className="flex flex-wrap items-end gap-3">
              <FormField
                label={`Crop ${i + 1}`}
                error={errors.holesPerDisc?.[i]?.crop?.message}
                className="w-48"
              >
                <Select
                  {...form.register(`holesPerDisc.${i}.crop`)}
                  placeholder="Choose a crop"
                  options={labelled(CROPS, CROP_LABELS)}
                />
              </FormField>
              <FormField
                label={
                  <>
                    Holes per disc<span className="sr-only"> for crop {i + 1}</span>
                  </>
                }
                error={errors.holesPerDisc?.[i]?.holes?.message}
                className="w-36"
              >
                <Input
                  type="number"
                  min={1}
                  {...form.register(`holesPerDisc.${i}.holes`, { valueAsNumber: true })}
                />
              </FormField>
              <Button
                variant="ghost"
                size="md"
                onClick={() => holes.remove(i)}
                disabled={holes.fields.length === 1}
                aria-label={`Remove crop ${i + 1}`}
              >
                Remove
              </Button>
            </div>
          ))}
          {holesError ? <p className="text-xs font-medium text-danger">{holesError}</p> : null}
          <Button
            size="sm"
            onClick={() => nextCrop && holes.append({ crop: nextCrop, holes: Number.NaN })}
            disabled={!nextCrop}
          >
            Add a crop
          </Button>
        </div>
        <div className="grid gap-4 sm:grid-cols-3">
          {numberField('discRpmMin', { unit: 'rpm' })}
          {numberField('discRpmMax', { unit: 'rpm' })}
        </div>
        <Notice tone="caution" title="Working near the meter">
          A meter checked with a simulated speed while the tractor stands still turns its drives: keep hands
          and tools clear of moving parts, follow the machine's operator manual, and handle treated seed as
          its label directs.
        </Notice>
      </FormSection>

      <FormSection title="Ground speed">
        <div className="grid gap-4 sm:grid-cols-3">
          {numberField('speedMinMps', { unit: speedUnit })}
          {numberField('speedPlannedMps', { unit: speedUnit })}
          {numberField('speedMaxMps', { unit: speedUnit })}
        </div>
        <FormField
          label={LABELS.groundSpeedSource}
          error={err('groundSpeedSource')}
          hint="GNSS measures true speed over the ground; a wheel sensor reads high when the wheel slips, and the meter then sows more than the target."
          className="sm:w-1/2"
        >
          <Select
            {...form.register('groundSpeedSource')}
            placeholder="Choose a source"
            options={labelled(GROUND_SPEED_SOURCES, GROUND_SPEED_SOURCE_LABELS)}
          />
        </FormField>
      </FormSection>

      <FormField label={LABELS.notes} error={err('notes')}>
        <Textarea {...form.register('notes')} />
      </FormField>
      <FormActions
        submitLabel={planter ? 'Save changes' : 'Add planter'}
        busy={create.isPending || update.isPending}
        cancelTo={cancelTo}
        error={save.formError}
      />
    </form>
  );
}
