import { useForm, useWatch, type DefaultValues, type FieldErrors, type Resolver } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { CROP_LABELS, CROPS } from '@shared/schemas/crops';
import {
  productInputSchema,
  RATE_KIND_LABELS,
  type Product,
  type PRODUCT_KINDS,
} from '@shared/schemas/product.schema';
import { QUANTITY_UNIT_DEFS } from '@shared/rates/rate-units';
import { DEFAULT_SEEDS_PER_UNIT } from '@shared/rates/seed-units';
import type { UnitSystem } from '@shared/units';
import { FormActions, FormSection } from '@/components/form/form-actions';
import { useSaveErrors } from '@/components/form/use-save-errors';
import { FormField } from '@/components/ui/form-field';
import { Input, labelled, Select, Textarea } from '@/components/ui/input';
import { Notice } from '@/components/ui/notice';
import { ReadOnlyValue } from '@/components/ui/read-only-value';
import { formatNumber } from '@/lib/format';
import { useUnitSystem } from '@/lib/viewer';
import { getProduct } from '../api/get-product';
import { useCreateProduct, useUpdateProduct, type ProductBody } from '../api/save-product';
import {
  defaultSeedsPerUnit,
  formToSi,
  productToForm,
  sizeUnit,
  type ProductFormValues,
} from './product-values';

const LABELS: Record<string, string> = {
  kind: 'Kind of product',
  name: 'Name',
  crop: 'Crop',
  rateKind: 'Rate measured by',
  unitName: 'Unit name',
  unitSize: 'Unit size',
  pricePerUnit: 'Price per unit',
  currency: 'Currency',
  notes: 'Notes',
};

const KIND_LABELS: Record<(typeof PRODUCT_KINDS)[number], string> = {
  seed: 'Seed',
  other: 'Other product (fertiliser, in-furrow)',
};

/** Validates with the shared schema after converting the unit size from the person's units to SI. */
function productResolver(
  system: UnitSystem,
  saved?: Product,
): Resolver<ProductFormValues, unknown, ProductBody> {
  const inner = zodResolver(productInputSchema);
  return async (values, context, options) => {
    const result = await inner(
      formToSi(values, system, saved),
      context,
      options as unknown as Parameters<typeof inner>[2],
    );
    if (Object.keys(result.errors).length === 0) return { values: result.values as ProductBody, errors: {} };
    return { values: {}, errors: result.errors as FieldErrors<ProductFormValues> };
  };
}

const isDefaultSize = (v: number) => Object.values(DEFAULT_SEEDS_PER_UNIT).some((d) => d === v);

/**
 * Adds a product or edits one. The unit size is typed in the person's units (seeds; lb or kg; gal or L)
 * and sent in SI; choosing corn or soybean fills the usual seeds per unit, which stays editable.
 */
export function ProductForm({
  product,
  onSaved,
  cancelTo,
}: {
  product?: Product;
  onSaved: (p: Product) => void;
  cancelTo: string;
}) {
  const system = useUnitSystem();
  const toValues = (p?: Product) => productToForm(p, system);
  const form = useForm<ProductFormValues, unknown, ProductBody>({
    resolver: productResolver(system, product),
    defaultValues: toValues(product) as DefaultValues<ProductFormValues>,
  });
  const save = useSaveErrors(form, {
    labels: LABELS,
    reload: product ? async () => toValues(await getProduct(product.id)) : undefined,
  });
  const create = useCreateProduct();
  const update = useUpdateProduct();
  const [kind, rateKind, unitName] = useWatch({
    control: form.control,
    name: ['kind', 'rateKind', 'unitName'],
  });
  const { errors } = form.formState;
  const err = (key: keyof ProductFormValues) => errors[key]?.message;
  const seed = kind === 'seed';
  const quantity = QUANTITY_UNIT_DEFS[sizeUnit(seed ? 'count' : rateKind, system)].label;

  const onSubmit = form.handleSubmit((body) => {
    save.begin();
    const handlers = { onSuccess: onSaved, onError: save.onError };
    if (product) {
      const version = form.getValues('version') ?? product.version;
      update.mutate({ id: product.id, input: { ...body, version } }, handlers);
    } else {
      create.mutate(body, handlers);
    }
  });

  const kindField = form.register('kind', {
    onChange: (e: { target: { value: string } }) => {
      if (e.target.value === 'seed') form.setValue('rateKind', 'count');
      else {
        form.setValue('crop', '');
        if (form.getValues('rateKind') === 'count') form.setValue('rateKind', 'mass');
      }
    },
  });
  const cropField = form.register('crop', {
    onChange: (e: { target: { value: string } }) => {
      const seeds = defaultSeedsPerUnit(e.target.value as ProductFormValues['crop']);
      const typed = form.getValues('unitSize');
      if (seeds != null && (Number.isNaN(typed) || isDefaultSize(typed)))
        form.setValue('unitSize', seeds, { shouldDirty: true });
    },
  });

  return (
    <form onSubmit={onSubmit} noValidate className="max-w-3xl space-y-5">
      {save.conflictNotice}
      <div className="grid gap-4 sm:grid-cols-2">
        <FormField label={LABELS.kind} error={err('kind')}>
          <Select {...kindField} options={labelled(['seed', 'other'] as const, KIND_LABELS)} />
        </FormField>
        <FormField
          label={LABELS.name}
          error={err('name')}
          hint="Your own name for it, as it appears on orders."
        >
          <Input {...form.register('name')} />
        </FormField>
        {seed ? (
          <FormField label={LABELS.crop} error={err('crop')}>
            <Select {...cropField} placeholder="Choose a crop" options={labelled(CROPS, CROP_LABELS)} />
          </FormField>
        ) : null}
        {seed ? (
          <ReadOnlyValue
            label={LABELS.rateKind}
            value={RATE_KIND_LABELS.count}
            note="Seed is always rated by count: seeds per acre or per hectare."
          />
        ) : (
          <FormField label={LABELS.rateKind} error={err('rateKind')}>
            <Select
              {...form.register('rateKind')}
              options={labelled(['mass', 'volume'] as const, RATE_KIND_LABELS)}
            />
          </FormField>
        )}
      </div>

      <FormSection
        title="Purchase unit"
        description="What one unit you buy holds, and what it costs. Totals round up to whole units."
      >
        <div className="grid gap-4 sm:grid-cols-2">
          <FormField
            label={LABELS.unitName}
            error={err('unitName')}
            hint={seed ? 'Usually "unit" or "bag".' : 'For example "jug", "tote" or "bag".'}
          >
            <Input {...form.register('unitName')} />
          </FormField>
          <FormField
            label={LABELS.unitSize}
            unit={`${quantity} per ${unitName?.trim() || 'unit'}`}
            error={err('unitSize')}
            hint={
              seed
                ? `Corn is commonly sold in units of ${formatNumber(DEFAULT_SEEDS_PER_UNIT.corn)} seeds and soybean in ${formatNumber(DEFAULT_SEEDS_PER_UNIT.soybean)}; check your supplier's count.`
                : undefined
            }
          >
            <Input type="number" min={0} {...form.register('unitSize', { valueAsNumber: true })} />
          </FormField>
          <FormField
            label={LABELS.pricePerUnit}
            error={err('pricePerUnit')}
            hint="Leave empty if you do not want costs shown."
          >
            <Input type="number" min={0} {...form.register('pricePerUnit', { valueAsNumber: true })} />
          </FormField>
          <FormField
            label={LABELS.currency}
            error={err('currency')}
            hint="Three letters, such as USD or CAD."
          >
            <Input
              {...form.register('currency')}
              maxLength={3}
              autoCapitalize="characters"
              className="font-mono uppercase"
            />
          </FormField>
        </div>
      </FormSection>

      {seed ? (
        <Notice tone="caution" title="Treated seed">
          A seed treatment is a pesticide: handle, store and plant treated seed as its label directs, and
          follow local rules for leftover seed and bags.
        </Notice>
      ) : (
        <Notice tone="caution" title="Products in the furrow">
          Rates and mixes of fertiliser or other products are for a qualified advisor to confirm: follow the
          product label and local rules.
        </Notice>
      )}

      <FormField label={LABELS.notes} error={err('notes')}>
        <Textarea {...form.register('notes')} />
      </FormField>
      <FormActions
        submitLabel={product ? 'Save changes' : 'Add product'}
        busy={create.isPending || update.isPending}
        cancelTo={cancelTo}
        error={save.formError}
      />
    </form>
  );
}
