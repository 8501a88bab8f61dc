import { z } from 'zod';
import { idSchema, listQuerySchema, nameText, versionSchema } from './common.schema';
import { areaGeometrySchema, lineStringGeometrySchema, multiPolygonGeometrySchema } from './geojson.schema';

export const zonePropsSchema = z.object({
  id: idSchema,
  name: z.string(),
  classValue: z.number().nullable(),
  productivityIndex: z.number().nullable(),
  isDefault: z.boolean(),
  areaM2: z.number(),
  meanValue: z.number().nullable(),
});
export type ZoneProps = z.infer<typeof zonePropsSchema>;

export const zoneFeatureSchema = z.object({
  type: z.literal('Feature'),
  id: z.string().optional(),
  properties: zonePropsSchema,
  geometry: multiPolygonGeometrySchema,
});
export type ZoneFeature = z.infer<typeof zoneFeatureSchema>;

export const overlapSchema = z.object({
  aId: idSchema,
  bId: idSchema,
  geometry: multiPolygonGeometrySchema,
  areaM2: z.number(),
});

export const zoneMapSchema = z.object({
  id: idSchema,
  fieldId: idSchema,
  fieldName: z.string(),
  seasonId: idSchema,
  seasonLabel: z.string(),
  growerId: idSchema,
  name: z.string(),
  versionNo: z.number().int(),
  source: z.enum(['drawn', 'imported', 'from-data']),
  /** For zones from data: which attribute, how it was classed. */
  sourceNote: z.string().nullable(),
  version: z.number().int(),
  boundary: multiPolygonGeometrySchema,
  zones: z.object({ type: z.literal('FeatureCollection'), features: z.array(zoneFeatureSchema) }),
  analysis: z.object({
    overlaps: z.array(overlapSchema),
    gapAreaM2: z.number(),
    zonesAreaM2: z.number(),
    boundaryAreaM2: z.number(),
  }),
  archivedAt: z.string().nullable(),
  updatedAt: z.string(),
});
export type ZoneMap = z.infer<typeof zoneMapSchema>;

export const zoneMapSummarySchema = zoneMapSchema
  .pick({
    id: true,
    fieldId: true,
    fieldName: true,
    seasonId: true,
    seasonLabel: true,
    growerId: true,
    name: true,
    versionNo: true,
    source: true,
    version: true,
    archivedAt: true,
    updatedAt: true,
  })
  .extend({ zoneCount: z.number() });
export const zoneMapListSchema = z.object({ items: z.array(zoneMapSummarySchema) });
export const zoneMapListQuerySchema = listQuerySchema.extend({
  fieldId: idSchema.optional(),
  seasonId: idSchema.optional(),
});

export const createZoneMapSchema = z.object({
  fieldId: idSchema,
  seasonId: idSchema,
  name: nameText('Name'),
});

export const zoneMapFromImportSchema = createZoneMapSchema.extend({
  importId: idSchema,
  featureIndexes: z.array(z.number().int().min(0)).min(1, 'Choose at least one feature'),
  nameProperty: z.string().nullable(),
  classProperty: z.string().nullable(),
  indexProperty: z.string().nullable(),
  /** Cover what the chosen zones leave of the boundary with a default zone. */
  fillGaps: z.boolean().default(false),
});

export const CLASS_METHODS = ['quantile', 'jenks', 'kmeans'] as const;
export const CLASS_METHOD_LABELS: Record<(typeof CLASS_METHODS)[number], string> = {
  quantile: 'Equal counts (quantiles)',
  jenks: 'Natural breaks',
  kmeans: 'k-means clusters',
};

export const zonesFromPointsSchema = createZoneMapSchema.extend({
  importId: idSchema,
  attribute: z.string().min(1, 'Choose the attribute to class'),
  method: z.enum(CLASS_METHODS),
  classes: z.number().int().min(2, 'At least 2 zones').max(9, 'At most 9 zones'),
  cellSizeM: z.number().min(2, 'Cells of at least 2 m').max(200, 'Cells of at most 200 m'),
  power: z.number().min(1).max(4).default(2),
  minAreaM2: z.number().min(0).max(500_000),
});

/** The preview takes the same choices; the name is only needed to save. */
export const zonesFromPointsPreviewRequestSchema = zonesFromPointsSchema.extend({
  name: z.string().optional(),
});

export const zonesFromPointsPreviewSchema = z.object({
  breaks: z.array(z.number()),
  histogram: z.array(z.object({ from: z.number(), to: z.number(), count: z.number() })),
  zones: z.array(
    z.object({
      classIndex: z.number(),
      geometry: multiPolygonGeometrySchema,
      meanValue: z.number(),
      areaM2: z.number(),
    }),
  ),
});

const edit = { version: versionSchema };
const classValue = z.number().int().min(0).max(254).nullable();
const productivityIndex = z.number().min(0).max(10).nullable();
export const addZoneSchema = z.object({
  ...edit,
  name: nameText('Zone name', 60),
  geometry: areaGeometrySchema,
  classValue,
  productivityIndex,
});
export const updateZoneSchema = z.object({
  ...edit,
  name: nameText('Zone name', 60),
  classValue,
  productivityIndex,
  geometry: areaGeometrySchema.optional(),
});
export const splitZoneSchema = z.object({ ...edit, zoneId: idSchema, line: lineStringGeometrySchema });
export const mergeZonesSchema = z.object({ ...edit, zoneIds: z.tuple([idSchema, idSchema]) });
export const resolveOverlapSchema = z.object({ ...edit, keepZoneId: idSchema, loseZoneId: idSchema });
export const zoneMapVersionOnlySchema = z.object(edit);
export const zoneMapVersionQuerySchema = z.object({ version: z.coerce.number().int().min(0) });

/** A new version copies the zones of the one it starts from; the name stays unless one is given. */
export const newZoneMapVersionSchema = z.object({ name: nameText('Name').optional() });

export const ZONE_EXPORT_FORMATS = ['geojson', 'shapefile'] as const;
export const zoneMapExportQuerySchema = z.object({
  format: z.enum(ZONE_EXPORT_FORMATS, { message: 'Choose format=geojson or format=shapefile' }),
});
