import { z } from 'zod';
import { idSchema, listQuerySchema, nameText, optionalText, versionSchema } from './common.schema';

const position = z
  .array(z.number().finite('Coordinates must be numbers'))
  .min(2, 'A position needs longitude and latitude')
  .max(3)
  .refine(([lon]) => lon >= -180 && lon <= 180, 'Longitude must lie between -180 and 180')
  .refine(([, lat]) => lat >= -90 && lat <= 90, 'Latitude must lie between -90 and 90');
const ring = z.array(position).min(4, 'A ring needs at least four positions (the last repeats the first)');

/** A boundary as GeoJSON geometry, [lon, lat] in WGS84. Validity is decided by PostGIS on the server. */
export const boundarySchema = z.union([
  z.object({ type: z.literal('Polygon'), coordinates: z.array(ring).min(1) }),
  z.object({ type: z.literal('MultiPolygon'), coordinates: z.array(z.array(ring).min(1)).min(1) }),
]);
export type Boundary = z.infer<typeof boundarySchema>;

export const fieldInputSchema = z.object({
  farmId: idSchema,
  name: nameText('Name'),
  notes: optionalText(),
  boundary: boundarySchema.nullable().optional(),
});
export type FieldInput = z.input<typeof fieldInputSchema>;

export const fieldUpdateSchema = fieldInputSchema.omit({ farmId: true }).extend({ version: versionSchema });

export const fieldSchema = z.object({
  id: idSchema,
  farmId: idSchema,
  farmName: z.string(),
  growerId: idSchema,
  growerName: z.string(),
  name: z.string(),
  notes: z.string().nullable(),
  boundary: z
    .object({ type: z.literal('MultiPolygon'), coordinates: z.array(z.array(z.array(z.array(z.number())))) })
    .nullable(),
  areaM2: z.number().nullable(),
  archivedAt: z.string().nullable(),
  version: z.number(),
  updatedAt: z.string(),
});
export type Field = z.infer<typeof fieldSchema>;
export const fieldListSchema = z.object({ items: z.array(fieldSchema) });

export const fieldListQuerySchema = listQuerySchema.extend({
  growerId: idSchema.optional(),
  farmId: idSchema.optional(),
});
