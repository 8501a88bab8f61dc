import { z } from 'zod';
import { idSchema } from './common.schema';
import { multiPolygonGeometrySchema } from './geojson.schema';

export const IMPORT_PURPOSES = ['boundary', 'zones', 'points'] as const;
export const importPurposeSchema = z.enum(IMPORT_PURPOSES);
export type ImportPurpose = z.infer<typeof importPurposeSchema>;

export const IMPORT_FORMATS = ['geojson', 'shapefile', 'kml', 'kmz', 'csv'] as const;

/** The multipart fields beside `file` in POST /api/imports. */
export const importRequestSchema = z.object({ purpose: importPurposeSchema, fieldId: idSchema });

export const crsCandidateSchema = z.object({ code: z.string(), label: z.string() });

export const validitySchema = z.object({
  valid: z.boolean(),
  /** PostGIS's reason, e.g. "Self-intersection[-93.6 42.01]". */
  reason: z.string().nullable(),
  /** [lon, lat] of the problem, when PostGIS names one. */
  location: z.array(z.number()).nullable(),
});

export const previewFeatureSchema = z.object({
  index: z.number().int(),
  /** Layer name, for a zip holding several. */
  layer: z.string().nullable(),
  properties: z.record(z.string(), z.unknown()),
  geometry: multiPolygonGeometrySchema,
  areaM2: z.number(),
  validity: validitySchema,
  /** What ST_MakeValid (polygons kept) would store instead, for an invalid feature. */
  repair: z.object({ geometry: multiPolygonGeometrySchema, areaM2: z.number() }).nullable(),
});
export type PreviewFeature = z.infer<typeof previewFeatureSchema>;

export const importPreviewSchema = z.object({
  id: idSchema,
  purpose: importPurposeSchema,
  format: z.enum(IMPORT_FORMATS),
  fileName: z.string(),
  layers: z.array(z.object({ name: z.string(), featureCount: z.number(), geometryType: z.string() })),
  coordinates: z.discriminatedUnion('kind', [
    z.object({ kind: z.literal('geographic'), source: z.string() }),
    z.object({
      kind: z.literal('projected'),
      bbox: z.array(z.number()),
      candidates: z.array(crsCandidateSchema),
    }),
  ]),
  /** Polygon features (boundary and zones purposes). Empty until the coordinate system is known. */
  features: z.array(previewFeatureSchema),
  /** Point layers: how many points, and which properties hold numbers (for zones from data). */
  pointCount: z.number().optional(),
  numericProperties: z
    .array(z.object({ name: z.string(), min: z.number(), max: z.number(), count: z.number() }))
    .optional(),
  /** Points as [lon, lat, value-of-first-numeric] samples, at most a few thousand, for the map preview. */
  warnings: z.array(z.string()),
});
export type ImportPreview = z.infer<typeof importPreviewSchema>;

export const chooseCoordinatesSchema = z.object({
  code: z.string().regex(/^EPSG:\d{4,6}$/, 'Use a code like EPSG:32615'),
});

export const setBoundarySchema = z.union([
  z.object({
    importId: idSchema,
    featureIndexes: z.array(z.number().int().min(0)).min(1, 'Choose at least one feature'),
    repair: z.boolean().default(false),
    version: z.number().int().min(0),
  }),
  z.object({
    geometry: z.union([
      multiPolygonGeometrySchema,
      z.object({ type: z.literal('Polygon'), coordinates: z.array(z.array(z.array(z.number()))) }),
    ]),
    repair: z.boolean().default(false),
    version: z.number().int().min(0),
  }),
]);
