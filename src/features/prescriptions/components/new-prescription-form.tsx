import { useForm, useWatch, type FieldErrors, type Resolver } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'react-router-dom';
import type { z } from 'zod';
import { CROP_LABELS } from '@shared/schemas/crops';
import { createPrescriptionSchema, type Prescription } from '@shared/schemas/prescription.schema';
import type { Planter } from '@shared/schemas/planter.schema';
import type { Product } from '@shared/schemas/product.schema';
import type { Season } from '@shared/schemas/season.schema';
import type { zoneMapSummarySchema } from '@shared/schemas/zone-map.schema';
import {
  defaultRateUnit,
  RATE_UNIT_DEFS,
  rateFromSi,
  rateToSi,
  rateUnitsOf,
  type RateUnit,
} from '@shared/rates/rate-units';
import { roundTo, type UnitSystem } from '@shared/units';
import { useSaveErrors } from '@/components/form/use-save-errors';
import { FormActions, FormSection } from '@/components/form/form-actions';
import { FormField } from '@/components/ui/form-field';
import { Input, Select } from '@/components/ui/input';
import { Notice } from '@/components/ui/notice';
import { formatDate } from '@/lib/format';
import { useCreatePrescription } from '../api/create-prescription';
import { Cautions } from './cautions';
import { startingRatesSi } from './rate-values';

type ZoneMapSummary = z.infer<typeof zoneMapSummarySchema>;
type CreateOut = z.output<typeof createPrescriptionSchema>;

const RATE_KEYS = ['defaultRateSi', 'outOfFieldRateSi', 'minRateSi', 'maxRateSi'] as const;
type RateKey = (typeof RATE_KEYS)[number];

/** The form holds the four rates in the chosen unit under the API's keys, so errors land beside them. */
type Values = {
  zoneMapId: string;
  productId: string;
  planterId: string;
  name: string;
  rateUnit: RateUnit;
} & Record<RateKey, number>;

const LABELS: Record<string, string> = {
  zoneMapId: 'Zone map',
  productId: 'Product',
  planterId: 'Planter',
  name: 'Name',
  rateUnit: 'Rate unit',
  defaultRateSi: 'Default rate',
  outOfFieldRateSi: 'Out-of-field rate',
  minRateSi: 'Lowest rate',
  maxRateSi: 'Highest rate',
};

const shown = (si: number, unit: RateUnit) => roundTo(rateFromSi(si, unit), RATE_UNIT_DEFS[unit].decimals);

/** The rates a product starts with, in `unit`: a crop's usual populations for seed, blanks otherwise. */
function startingRates(product: Product | undefined, unit: RateUnit): Record<RateKey, number> {
  const start = startingRatesSi(product);
  return {
    defaultRateSi: start ? shown(start.defaultRateSi, unit) : Number.NaN,
    outOfFieldRateSi: 0,
    minRateSi: start ? shown(start.minRateSi, unit) : Number.NaN,
    maxRateSi: start ? shown(start.maxRateSi, unit) : Number.NaN,
  };
}

/** Checks with the shared schema after turning the typed rates into SI. */
function resolverFor(): Resolver<Values, unknown, CreateOut> {
  const inner = zodResolver(createPrescriptionSchema);
  return async (values, context, options) => {
    const body = {
      zoneMapId: values.zoneMapId,
      productId: values.productId,
      planterId: values.planterId || null,
      name: values.name,
      rateUnit: values.rateUnit,
      defaultRateSi: rateToSi(values.defaultRateSi, values.rateUnit),
      outOfFieldRateSi: rateToSi(values.outOfFieldRateSi, values.rateUnit),
      minRateSi: rateToSi(values.minRateSi, values.rateUnit),
      maxRateSi: rateToSi(values.maxRateSi, values.rateUnit),
    };
    const result = await inner(body, context, options as unknown as Parameters<typeof inner>[2]);
    if (Object.keys(result.errors).length === 0) return { values: result.values as CreateOut, errors: {} };
    const errors = { ...result.errors } as Record<string, { message?: string; type?: string }>;
    if (!values.zoneMapId) errors.zoneMapId = { type: 'required', message: 'Choose the zone map' };
    if (!values.productId) errors.productId = { type: 'required', message: 'Choose the product' };
    return { values: {}, errors: errors as FieldErrors<Values> };
  };
}

/** Seed of the season's crop first, then other seed, then the other products. */
function productOptions(products: Product[], season: Season) {
  const groups = [
    {
      label: `Seed: ${CROP_LABELS[season.crop].toLowerCase()}`,
      items: products.filter((p) => p.kind === 'seed' && p.crop === season.crop),
    },
    {
      label: 'Seed of other crops',
      items: products.filter((p) => p.kind === 'seed' && p.crop !== season.crop),
    },
    { label: 'Other products', items: products.filter((p) => p.kind !== 'seed') },
  ];
  return groups.filter((g) => g.items.length > 0);
}

/** The newest zone map version of the season that is not archived. */
const newestMap = (maps: ZoneMapSummary[]) =>
  [...maps].filter((m) => !m.archivedAt).sort((a, b) => b.versionNo - a.versionNo)[0];

/**
 * A new prescription for one field's crop season: which zone map, which product and planter, its name and
 * rate unit, and the default, out-of-field, lowest and highest rates typed in that unit. Every zone starts
 * at the default rate; the rates are set per zone in the editor that opens next.
 */
export function NewPrescriptionForm({
  season,
  zoneMaps,
  planters,
  products,
  system,
  onCreated,
}: {
  season: Season;
  zoneMaps: ZoneMapSummary[];
  planters: Planter[];
  products: Product[];
  system: UnitSystem;
  onCreated: (p: Prescription) => void;
}) {
  const groups = productOptions(products, season);
  const firstProduct = groups[0]?.items[0];
  const firstUnit = defaultRateUnit(firstProduct?.rateKind ?? 'count', system);
  const form = useForm<Values, unknown, CreateOut>({
    resolver: resolverFor(),
    defaultValues: {
      zoneMapId: newestMap(zoneMaps)?.id ?? '',
      productId: firstProduct?.id ?? '',
      planterId: planters.filter((p) => !p.archivedAt).length === 1 ? planters[0].id : '',
      name: `${CROP_LABELS[season.crop]} ${season.year} rates`,
      rateUnit: firstUnit,
      ...startingRates(firstProduct, firstUnit),
    },
  });
  const save = useSaveErrors(form, { labels: LABELS });
  const create = useCreatePrescription();
  const [productId, rateUnit, zoneMapId] = useWatch({
    control: form.control,
    name: ['productId', 'rateUnit', 'zoneMapId'],
  });
  const product = products.find((p) => p.id === productId);
  const units = rateUnitsOf(product?.rateKind ?? 'count');
  const { errors } = form.formState;
  const err = (k: keyof Values) => errors[k]?.message;

  /** A new product: a new kind of rate may need other units and other starting rates. */
  const onProduct = (id: string) => {
    const next = products.find((p) => p.id === id);
    const before = products.find((p) => p.id === form.getValues('productId'));
    if (!next) return;
    const unit = rateUnitsOf(next.rateKind).includes(form.getValues('rateUnit'))
      ? form.getValues('rateUnit')
      : defaultRateUnit(next.rateKind, system);
    form.setValue('rateUnit', unit);
    if (before?.rateKind !== next.rateKind || before?.crop !== next.crop) {
      const start = startingRates(next, unit);
      for (const k of RATE_KEYS) form.setValue(k, start[k], { shouldValidate: form.formState.isSubmitted });
    }
  };

  /** Another unit: what was typed is converted, so the rates stay the same. */
  const onUnit = (unit: RateUnit) => {
    const from = form.getValues('rateUnit');
    for (const k of RATE_KEYS) {
      const v = form.getValues(k);
      if (Number.isFinite(v)) form.setValue(k, shown(rateToSi(v, from), unit));
    }
  };

  const onSubmit = form.handleSubmit((body) => {
    save.begin();
    create.mutate(body, { onSuccess: onCreated, onError: save.onError });
  });

  const liveMaps = zoneMaps.filter((m) => !m.archivedAt);
  const unitLabel = RATE_UNIT_DEFS[rateUnit]?.label ?? '';
  const rateField = (key: RateKey, hint?: string) => (
    <FormField label={LABELS[key]} unit={unitLabel} hint={hint} error={err(key)}>
      <Input type="number" min={0} {...form.register(key, { valueAsNumber: true })} />
    </FormField>
  );

  return (
    <form onSubmit={onSubmit} noValidate className="max-w-4xl space-y-5">
      <FormSection
        title="Zones"
        description="The prescription takes a copy of the zone map's zones as they are now; later changes to the zone map do not reach it."
      >
        {liveMaps.length === 0 ? (
          <Notice tone="caution" title="This season has no zone map">
            Rates are set per zone, so the field needs a zone map for this season first.{' '}
            <Link
              className="text-clay-700 underline"
              to={`/zone-maps/new?fieldId=${season.fieldId}&seasonId=${season.id}`}
            >
              Make a zone map
            </Link>
          </Notice>
        ) : (
          <div role="radiogroup" aria-label="Zone map" className="space-y-1.5">
            {liveMaps
              .sort((a, b) => b.versionNo - a.versionNo)
              .map((m) => (
                <label
                  key={m.id}
                  className={`flex cursor-pointer items-center gap-3 rounded-card border px-3 py-2 text-sm ${zoneMapId === m.id ? 'border-clay-300 bg-clay-50' : 'border-ink-line bg-paper-raised hover:bg-paper'}`}
                >
                  <input
                    type="radio"
                    value={m.id}
                    className="accent-clay-600"
                    {...form.register('zoneMapId')}
                  />
                  <span className="font-medium text-ink">{m.name}</span>
                  <span className="font-mono text-ink-soft">v{m.versionNo}</span>
                  <span className="text-ink-soft">
                    {m.zoneCount} {m.zoneCount === 1 ? 'zone' : 'zones'} · changed {formatDate(m.updatedAt)}
                  </span>
                </label>
              ))}
            {err('zoneMapId') ? <p className="text-xs font-medium text-danger">{err('zoneMapId')}</p> : null}
          </div>
        )}
      </FormSection>

      <FormSection title="Product and planter">
        <div className="grid gap-4 sm:grid-cols-2">
          <FormField
            label={LABELS.productId}
            error={err('productId')}
            hint={
              products.length === 0 ? (
                <>
                  No products yet.{' '}
                  <Link className="text-clay-700 underline" to="/products/new">
                    Add one
                  </Link>
                </>
              ) : undefined
            }
          >
            <Select
              {...form.register('productId', { onChange: (e) => onProduct(e.target.value) })}
              placeholder="Choose a product"
            >
              {groups.map((g) => (
                <optgroup key={g.label} label={g.label}>
                  {g.items.map((p) => (
                    <option key={p.id} value={p.id}>
                      {p.name}
                    </option>
                  ))}
                </optgroup>
              ))}
            </Select>
          </FormField>
          <FormField
            label={LABELS.planterId}
            error={err('planterId')}
            hint="With a planter, every zone's rate is checked against what its seed disc can deliver."
          >
            <Select
              {...form.register('planterId')}
              placeholder="No planter (no check)"
              options={planters.filter((p) => !p.archivedAt).map((p) => ({ value: p.id, label: p.name }))}
            />
          </FormField>
        </div>
        {product?.kind === 'seed' && product.crop && product.crop !== season.crop ? (
          <Notice tone="caution" title="Not the season's crop">
            {product.name} is {CROP_LABELS[product.crop].toLowerCase()} seed, but this season grows{' '}
            {CROP_LABELS[season.crop].toLowerCase()}. Choose seed of {CROP_LABELS[season.crop].toLowerCase()}.
          </Notice>
        ) : null}
        {product?.kind === 'seed' ? <Cautions which={['treated-seed']} /> : null}
      </FormSection>

      <FormSection
        title="Name and rates"
        description="Every zone starts at the default rate. The out-of-field rate is what the controller applies outside the boundary, usually nothing. Zone rates must stay between the lowest and highest rate."
      >
        <div className="grid gap-4 sm:grid-cols-2">
          <FormField label={LABELS.name} error={err('name')}>
            <Input {...form.register('name')} />
          </FormField>
          <FormField
            label={LABELS.rateUnit}
            error={err('rateUnit')}
            hint="Rates are kept exactly; this is how they read."
          >
            <Select
              {...form.register('rateUnit')}
              onChange={(e) => {
                const unit = e.target.value as RateUnit;
                onUnit(unit);
                form.setValue('rateUnit', unit);
              }}
              options={units.map((u) => ({ value: u, label: RATE_UNIT_DEFS[u].title }))}
            />
          </FormField>
        </div>
        <div className="grid gap-4 sm:grid-cols-4">
          {rateField('defaultRateSi')}
          {rateField('outOfFieldRateSi')}
          {rateField('minRateSi')}
          {rateField('maxRateSi')}
        </div>
      </FormSection>
      {save.conflictNotice}
      <FormActions
        submitLabel="Create the draft"
        busy={create.isPending}
        cancelTo="/prescriptions"
        error={save.formError}
      />
    </form>
  );
}
