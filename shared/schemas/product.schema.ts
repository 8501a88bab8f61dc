import { z } from 'zod';
import { idSchema, listQuerySchema, nameText, optionalText, versionSchema } from './common.schema';
import { cropSchema } from './crops';
import { RATE_KINDS } from '../rates/rate-units';

/**
 * Products of a workspace. A seed product is metered by count (seeds); other products (starter fertiliser,
 * in-furrow products) by mass or volume. `unitSize` is how much one purchase unit holds, in SI: seeds for
 * a seed product (80 000 corn, 140 000 soybean by default: shared/rates/seed-units.ts), kg for mass,
 * m³ for volume. Price is per purchase unit in the product's currency.
 */
export const PRODUCT_KINDS = ['seed', 'other'] as const;
export const productKindSchema = z.enum(PRODUCT_KINDS, { message: 'Choose seed or another product' });
export const rateKindSchema = z.enum(RATE_KINDS, { message: 'Choose how the rate is measured' });
export const RATE_KIND_LABELS: Record<(typeof RATE_KINDS)[number], string> = {
  count: 'Seeds (count per area)',
  mass: 'Mass per area',
  volume: 'Volume per area',
};

const productFields = z.object({
  kind: productKindSchema,
  name: nameText('Name', 80),
  /** Seed: the crop; other products: null. */
  crop: cropSchema.nullable(),
  rateKind: rateKindSchema,
  /** Name of a purchase unit: "unit", "bag", "box", "tote", "jug". */
  unitName: nameText('Unit name', 20),
  unitSize: z
    .number({ message: 'Unit size is required' })
    .finite()
    .positive('Unit size must be more than zero')
    .max(1e9, 'Unit size is too large'),
  pricePerUnit: z
    .number({ message: 'Price must be a number' })
    .finite()
    .min(0, 'Price cannot be negative')
    .max(1e6, 'Price must be at most 1,000,000')
    .nullable(),
  currency: z
    .string()
    .regex(/^[A-Z]{3}$/, 'Use a three-letter currency code such as USD')
    .default('USD'),
  notes: optionalText(),
});

type ProductShape = z.infer<typeof productFields>;

function checkProduct(p: ProductShape, ctx: z.RefinementCtx) {
  if (p.kind === 'seed') {
    if (!p.crop) ctx.addIssue({ code: 'custom', path: ['crop'], message: 'A seed product needs its crop' });
    if (p.rateKind !== 'count') {
      ctx.addIssue({
        code: 'custom',
        path: ['rateKind'],
        message: 'Seed is rated by count (seeds per area)',
      });
    }
    if (!Number.isInteger(p.unitSize)) {
      ctx.addIssue({ code: 'custom', path: ['unitSize'], message: 'Seeds per unit must be a whole number' });
    }
  } else {
    if (p.crop) ctx.addIssue({ code: 'custom', path: ['crop'], message: 'Only seed products have a crop' });
    if (p.rateKind === 'count') {
      ctx.addIssue({ code: 'custom', path: ['rateKind'], message: 'Choose mass or volume for this product' });
    }
  }
}

export const productInputSchema = productFields.superRefine(checkProduct);
export type ProductInput = z.input<typeof productInputSchema>;
export const productUpdateSchema = productFields.extend({ version: versionSchema }).superRefine(checkProduct);

export const productSchema = z.object({
  id: idSchema,
  kind: productKindSchema,
  name: z.string(),
  crop: cropSchema.nullable(),
  rateKind: rateKindSchema,
  unitName: z.string(),
  unitSize: z.number(),
  pricePerUnit: z.number().nullable(),
  currency: z.string(),
  notes: z.string().nullable(),
  archivedAt: z.string().nullable(),
  version: z.number(),
  updatedAt: z.string(),
});
export type Product = z.infer<typeof productSchema>;
export const productListSchema = z.object({ items: z.array(productSchema) });
export const productListQuerySchema = listQuerySchema.extend({
  kind: productKindSchema.optional(),
  crop: cropSchema.optional(),
});
