import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { updateZoneSchema, type ZoneMap, type ZoneProps } from '@shared/schemas/zone-map.schema';
import type { UnitSystem } from '@shared/units';
import { isStaleVersion } from '@/components/form/use-save-errors';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { FormField } from '@/components/ui/form-field';
import { Input } from '@/components/ui/input';
import { applyApiError } from '@/lib/form-errors';
import { formatArea, formatNumber } from '@/lib/format';
import { useUpdateZone } from '../api/update-zone';

const formSchema = updateZoneSchema.omit({ version: true, geometry: true });
type Values = z.input<typeof formSchema>;

const LABELS = { name: 'Zone name', classValue: 'Class', productivityIndex: 'Productivity index' };
const numberOrNull = (v: unknown) => (v === '' || v == null ? null : Number(v));

/** What one zone is; for those who may edit, its name, class and productivity index. */
export function ZonePanel({
  map,
  zone,
  system,
  canEdit,
  onStale,
}: {
  map: ZoneMap;
  zone: ZoneProps;
  system: UnitSystem;
  canEdit: boolean;
  onStale: () => void;
}) {
  const update = useUpdateZone(map.id);
  const form = useForm<Values>({
    resolver: zodResolver(formSchema),
    defaultValues: {
      name: zone.name,
      classValue: zone.classValue,
      productivityIndex: zone.productivityIndex,
    },
  });
  const { errors, isDirty } = form.formState;
  const share = map.analysis.boundaryAreaM2 > 0 ? (100 * zone.areaM2) / map.analysis.boundaryAreaM2 : null;

  const submit = form.handleSubmit((values) => {
    update.mutate(
      { mapId: map.id, zoneId: zone.id, input: { ...formSchema.parse(values), version: map.version } },
      {
        onError: (e) => {
          if (isStaleVersion(e)) onStale();
          else {
            const left = applyApiError(e, form.setError, Object.keys(LABELS));
            if (left) form.setError('root', { message: left });
          }
        },
      },
    );
  });

  return (
    <div
      className="space-y-3 rounded-card border border-ink-line bg-paper-raised p-3"
      aria-label={`Zone ${zone.name}`}
      role="group"
    >
      <div>
        <p className="flex flex-wrap items-center gap-2 text-base font-semibold text-ink">
          {zone.name}
          {zone.isDefault ? <Badge>Default zone</Badge> : null}
        </p>
        <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-sm">
          <dt className="text-ink-soft">Area</dt>
          <dd className="font-mono tabular-nums">
            {formatArea(zone.areaM2, system)}
            {share != null ? (
              <span className="text-ink-soft"> ({formatNumber(share, 1)} % of the field)</span>
            ) : null}
          </dd>
          <dt className="text-ink-soft">Class</dt>
          <dd className="font-mono">{zone.classValue ?? '—'}</dd>
          <dt className="text-ink-soft">Productivity index</dt>
          <dd className="font-mono">
            {zone.productivityIndex == null ? '—' : formatNumber(zone.productivityIndex, 2)}
          </dd>
          {zone.meanValue != null ? (
            <>
              <dt className="text-ink-soft">Mean of the data</dt>
              <dd className="font-mono">{formatNumber(zone.meanValue, 2)}</dd>
            </>
          ) : null}
        </dl>
      </div>
      {canEdit ? (
        <form
          key={`${zone.id}-${map.version}`}
          onSubmit={submit}
          noValidate
          className="space-y-2 border-t border-ink-line pt-3"
        >
          <FormField label={LABELS.name} error={errors.name?.message}>
            <Input {...form.register('name')} />
          </FormField>
          <div className="grid grid-cols-2 gap-2">
            <FormField
              label={LABELS.classValue}
              error={errors.classValue?.message}
              hint="Whole number, 0–254"
            >
              <Input
                type="number"
                step={1}
                min={0}
                max={254}
                {...form.register('classValue', { setValueAs: numberOrNull })}
              />
            </FormField>
            <FormField label={LABELS.productivityIndex} error={errors.productivityIndex?.message} hint="0–10">
              <Input
                type="number"
                min={0}
                max={10}
                {...form.register('productivityIndex', { setValueAs: numberOrNull })}
              />
            </FormField>
          </div>
          {errors.root?.message ? (
            <p className="text-xs font-medium text-danger">{errors.root.message}</p>
          ) : null}
          <Button type="submit" size="sm" variant="primary" disabled={!isDirty} busy={update.isPending}>
            Save the zone
          </Button>
        </form>
      ) : null}
    </div>
  );
}
