import { z } from 'zod';
import { idSchema, listQuerySchema, optionalText, versionSchema } from './common.schema';
import { cropSchema } from './crops';

/** A calendar date as YYYY-MM-DD; an empty string means no date. */
const isoDate = z
  .union([z.literal(''), z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date as YYYY-MM-DD')])
  .optional()
  .nullable()
  .transform((v) => (v ? v : null))
  .refine((v) => v === null || !Number.isNaN(Date.parse(`${v}T00:00:00Z`)), 'Not a real date');

/** A crop season: what is planted in one field in one year. */
export const seasonInputSchema = z.object({
  fieldId: idSchema,
  year: z.number({ message: 'Year is required' }).int('Year must be a whole number').min(1990).max(2100),
  crop: cropSchema,
  plannedPlantingDate: isoDate,
  notes: optionalText(),
});
export type SeasonInput = z.input<typeof seasonInputSchema>;

export const seasonUpdateSchema = seasonInputSchema
  .omit({ fieldId: true })
  .extend({ version: versionSchema });

export const seasonSchema = z.object({
  id: idSchema,
  fieldId: idSchema,
  fieldName: z.string(),
  farmName: z.string(),
  growerId: idSchema,
  growerName: z.string(),
  year: z.number(),
  crop: cropSchema,
  plannedPlantingDate: z.string().nullable(),
  notes: z.string().nullable(),
  archivedAt: z.string().nullable(),
  version: z.number(),
  updatedAt: z.string(),
});
export type Season = z.infer<typeof seasonSchema>;
export const seasonListSchema = z.object({ items: z.array(seasonSchema) });

export const seasonListQuerySchema = listQuerySchema.extend({
  growerId: idSchema.optional(),
  fieldId: idSchema.optional(),
  year: z.coerce.number().int().min(1990).max(2100).optional(),
});
