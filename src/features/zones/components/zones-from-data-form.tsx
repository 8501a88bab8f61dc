import { useMemo, useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import type { ImportPreview } from '@shared/schemas/import.schema';
import type { MultiPolygonGeometry } from '@shared/schemas/geojson.schema';
import {
  CLASS_METHOD_LABELS,
  CLASS_METHODS,
  zonesFromPointsSchema,
  type ZoneMap,
} from '@shared/schemas/zone-map.schema';
import { acToM2, areaToDisplay, areaUnitLabel, haToM2, M_PER_FT, type UnitSystem } from '@shared/units';
import { MapLegend } from '@/components/map/legend';
import { MapFrame } from '@/components/map/map-frame';
import { rampColours } from '@/components/map/ramp';
import { ProblemList } from '@/components/form/problem-list';
import { Button } from '@/components/ui/button';
import { FormField } from '@/components/ui/form-field';
import { Input, labelled, Select } from '@/components/ui/input';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { formatArea, formatNumber } from '@/lib/format';
import { useCreateZonesFromPoints } from '../api/create-zones-from-points';
import { usePreviewZonesFromPoints, type ZonesFromPointsChoices } from '../api/preview-zones-from-points';
import { ClassHistogram } from './class-histogram';
import { basicsProblem, type ZoneMapBasics } from './zone-map-basics';

const formSchema = z.object({
  attribute: z.string().min(1, 'Choose the attribute to class'),
  method: z.enum(CLASS_METHODS),
  classes: z
    .number({ message: 'How many zones?' })
    .int('A whole number')
    .min(2, 'At least 2 zones')
    .max(9, 'At most 9 zones'),
  cellSize: z.number({ message: 'Give a cell size' }).positive('Give a cell size'),
  minArea: z.number({ message: 'Give a minimum area (0 for none)' }).min(0, 'Not below 0'),
  power: z.number({ message: 'Give a power' }).min(1, 'From 1').max(4, 'To 4'),
});
type Values = z.infer<typeof formSchema>;

const LABELS = {
  attribute: 'Attribute',
  method: 'How to class',
  classes: 'Zones',
  cellSize: 'Cell size',
  minArea: 'Smallest zone',
  power: 'Distance weighting power',
};
/** The API's names for the converted inputs, so its refusals land beside the right input. */
const API_TO_FORM: Record<string, keyof Values> = { cellSizeM: 'cellSize', minAreaM2: 'minArea' };

/** The values a class holds, from the breaks: "to 190.26", "190.26 to 211.40", "above 225.96". */
const classRange = (breaks: number[], i: number) =>
  i === 0
    ? `to ${formatNumber(breaks[0] ?? 0, 2)}`
    : i === breaks.length
      ? `above ${formatNumber(breaks[i - 1], 2)}`
      : `${formatNumber(breaks[i - 1], 2)} to ${formatNumber(breaks[i], 2)}`;

const lengthUnit = (s: UnitSystem) => (s === 'imperial' ? 'ft' : 'm');
const cellToM = (v: number, s: UnitSystem) => (s === 'imperial' ? v * M_PER_FT : v);
const areaToM2 = (v: number, s: UnitSystem) => (s === 'imperial' ? acToM2(v) : haToM2(v));

/**
 * Zones from a point layer: choose the attribute and how to class it, preview the zones with a histogram
 * of the classing, and create the zone map once the preview looks right. The preview answers for the
 * choices it was made with; change one and it must be made again.
 */
export function ZonesFromDataForm({
  preview,
  fieldId,
  basics,
  boundary,
  system,
  onCreated,
}: {
  preview: ImportPreview;
  fieldId: string;
  basics: ZoneMapBasics;
  boundary: MultiPolygonGeometry;
  system: UnitSystem;
  onCreated: (m: ZoneMap) => void;
}) {
  const numeric = preview.numericProperties ?? [];
  const form = useForm<Values>({
    resolver: zodResolver(formSchema),
    defaultValues: {
      attribute: numeric[0]?.name ?? '',
      method: 'quantile',
      classes: 4,
      cellSize: system === 'imperial' ? 30 : 10,
      minArea: system === 'imperial' ? 0.5 : 0.2,
      power: 2,
    },
  });
  const { errors } = form.formState;
  const classing = usePreviewZonesFromPoints();
  const create = useCreateZonesFromPoints();
  const [asked, setAsked] = useState<ZonesFromPointsChoices | null>(null);
  const [basicsError, setBasicsError] = useState<string | null>(null);

  const choicesOf = (v: Values): ZonesFromPointsChoices => ({
    importId: preview.id,
    fieldId,
    seasonId: basics.seasonId,
    name: basics.name,
    attribute: v.attribute,
    method: v.method,
    classes: v.classes,
    cellSizeM: cellToM(v.cellSize, system),
    minAreaM2: areaToM2(v.minArea, system),
    power: v.power,
  });
  const placeErrors = (e: unknown) => {
    if (!isApiError(e)) return;
    for (const d of e.details) {
      const key =
        API_TO_FORM[String(d.path[0])] ??
        (String(d.path[0]) in LABELS ? (String(d.path[0]) as keyof Values) : null);
      if (key) form.setError(key, { type: 'server', message: d.message });
    }
  };

  const runPreview = form.handleSubmit((v) => {
    const choices = choicesOf(v);
    setAsked(choices);
    classing.mutate(choices, { onError: placeErrors });
  });
  const values = form.watch();
  const current = useMemo(() => JSON.stringify({ ...asked, name: undefined, seasonId: undefined }), [asked]);
  const parsed = formSchema.safeParse(values);
  const upToDate =
    !!asked &&
    parsed.success &&
    JSON.stringify({ ...choicesOf(parsed.data), name: undefined, seasonId: undefined }) === current;

  const save = () => {
    if (!asked) return;
    const problem = basicsProblem(basics);
    setBasicsError(problem);
    if (problem) return;
    create.mutate(zonesFromPointsSchema.parse({ ...asked, seasonId: basics.seasonId, name: basics.name }), {
      onSuccess: onCreated,
      onError: placeErrors,
    });
  };

  const result = classing.data;
  const colours = result ? rampColours(result.breaks.length + 1) : [];
  const attribute = numeric.find((n) => n.name === (asked?.attribute ?? values.attribute));

  if (numeric.length === 0) {
    return (
      <Notice tone="caution" title="No numbers to class">
        The points in this file carry no numeric attribute, so there is nothing to make zones from. Choose a
        file with a yield, soil conductivity or organic matter column.
      </Notice>
    );
  }

  return (
    <div className="space-y-4">
      <form
        onSubmit={runPreview}
        noValidate
        className="space-y-3 rounded-card border border-ink-line bg-paper-raised p-4"
      >
        <div className="grid gap-3 sm:grid-cols-3">
          <FormField label={LABELS.attribute} error={errors.attribute?.message}>
            <Select
              {...form.register('attribute')}
              options={numeric.map((n) => ({
                value: n.name,
                label: `${n.name} (${formatNumber(n.min, 2)} to ${formatNumber(n.max, 2)})`,
              }))}
            />
          </FormField>
          <FormField label={LABELS.method} error={errors.method?.message}>
            <Select {...form.register('method')} options={labelled(CLASS_METHODS, CLASS_METHOD_LABELS)} />
          </FormField>
          <FormField label={LABELS.classes} error={errors.classes?.message} hint="2 to 9">
            <Input
              type="number"
              step={1}
              min={2}
              max={9}
              {...form.register('classes', { valueAsNumber: true })}
            />
          </FormField>
          <FormField
            label={LABELS.cellSize}
            unit={lengthUnit(system)}
            error={errors.cellSize?.message}
            hint="The grid the points are spread onto"
          >
            <Input type="number" min={0} {...form.register('cellSize', { valueAsNumber: true })} />
          </FormField>
          <FormField
            label={LABELS.minArea}
            unit={areaUnitLabel(system)}
            error={errors.minArea?.message}
            hint="Smaller pieces join their largest neighbour"
          >
            <Input type="number" min={0} {...form.register('minArea', { valueAsNumber: true })} />
          </FormField>
          <FormField
            label={LABELS.power}
            error={errors.power?.message}
            hint="Inverse distance weighting; 2 is usual"
          >
            <Input type="number" min={1} max={4} {...form.register('power', { valueAsNumber: true })} />
          </FormField>
        </div>
        <p className="text-xs text-ink-soft">
          {preview.pointCount != null ? `${preview.pointCount.toLocaleString('en-US')} points. ` : ''}
          {attribute
            ? `${attribute.name}: ${attribute.count.toLocaleString('en-US')} values from ${formatNumber(attribute.min, 2)} to ${formatNumber(attribute.max, 2)}.`
            : ''}
        </p>
        <Button type="submit" variant={upToDate ? 'secondary' : 'primary'} busy={classing.isPending}>
          Preview the zones
        </Button>
      </form>
      {classing.isError ? (
        <Notice tone="danger" title="No preview">
          <ProblemList error={classing.error} />
        </Notice>
      ) : null}
      {result ? (
        <div className="space-y-3">
          {!upToDate ? (
            <Notice tone="info">
              The choices changed since this preview: preview again before creating the zone map.
            </Notice>
          ) : null}
          <div className="grid gap-4 lg:grid-cols-[minmax(0,3fr)_minmax(16rem,2fr)]">
            <MapFrame
              label="Preview of the zones from data"
              unitSystem={system}
              boundary={boundary}
              areas={result.zones.map((z, i) => ({
                id: `p${i}`,
                geometry: z.geometry,
                colour: colours[z.classIndex] ?? colours[0],
                style: 'zone',
              }))}
              describeArea={(id) => {
                const z = result.zones[Number(id.slice(1))];
                return z
                  ? `Class ${z.classIndex + 1}: mean ${formatNumber(z.meanValue, 2)}, ${formatArea(z.areaM2, system)}`
                  : null;
              }}
              fitKey={fieldId}
              legend={
                <MapLegend
                  title={asked?.attribute ?? 'Classes'}
                  entries={colours.map((c, i) => ({
                    key: String(i),
                    colour: c,
                    label: `Class ${i + 1}: ${classRange(result.breaks, i)}`,
                  }))}
                />
              }
            />
            <div className="space-y-3">
              <ClassHistogram
                bins={result.histogram}
                breaks={result.breaks}
                attribute={asked?.attribute ?? ''}
              />
              <table className="w-full text-sm" aria-label="Zones of the preview">
                <thead>
                  <tr className="border-b border-ink-line text-xs text-ink-soft">
                    <th className="py-1 text-left font-medium">Class</th>
                    <th className="py-1 text-right font-medium">Mean</th>
                    <th className="py-1 text-right font-medium">Area ({areaUnitLabel(system)})</th>
                  </tr>
                </thead>
                <tbody>
                  {result.zones.map((z, i) => (
                    <tr key={i} className="border-b border-ink-line/60">
                      <td className="py-1">
                        <span
                          aria-hidden
                          className="mr-2 inline-block h-3 w-4 rounded-[2px] align-middle"
                          style={{ backgroundColor: colours[z.classIndex] }}
                        />
                        {z.classIndex + 1}
                      </td>
                      <td className="py-1 text-right font-mono">{formatNumber(z.meanValue, 2)}</td>
                      <td className="py-1 text-right font-mono">
                        {formatNumber(areaToDisplay(z.areaM2, system), 2)}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </div>
          {basicsError ? <Notice tone="danger">{basicsError}</Notice> : null}
          {create.isError ? (
            <Notice tone="danger" title="The zone map was not created">
              <ProblemList error={create.error} />
            </Notice>
          ) : null}
          <Button variant="primary" disabled={!upToDate} busy={create.isPending} onClick={save}>
            Create the zone map
          </Button>
        </div>
      ) : null}
    </div>
  );
}
