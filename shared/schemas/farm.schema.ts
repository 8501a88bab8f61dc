import { z } from 'zod';
import { idSchema, listQuerySchema, nameText, optionalText, versionSchema } from './common.schema';

export const farmInputSchema = z.object({
  growerId: idSchema,
  name: nameText('Name'),
  notes: optionalText(),
});
export type FarmInput = z.input<typeof farmInputSchema>;

/** A farm cannot move to another grower: the grower is fixed once created. */
export const farmUpdateSchema = farmInputSchema.omit({ growerId: true }).extend({ version: versionSchema });

export const farmSchema = z.object({
  id: idSchema,
  growerId: idSchema,
  growerName: z.string(),
  name: z.string(),
  notes: z.string().nullable(),
  archivedAt: z.string().nullable(),
  version: z.number(),
  fieldCount: z.number(),
  areaM2: z.number(),
  updatedAt: z.string(),
});
export type Farm = z.infer<typeof farmSchema>;
export const farmListSchema = z.object({ items: z.array(farmSchema) });

export const farmListQuerySchema = listQuerySchema.extend({ growerId: idSchema.optional() });
