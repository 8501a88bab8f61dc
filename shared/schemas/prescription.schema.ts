import { z } from 'zod';
import { idSchema, listQuerySchema, nameText, versionSchema } from './common.schema';
import { cropSchema } from './crops';
import { multiPolygonGeometrySchema } from './geojson.schema';
import { productSchema } from './product.schema';
import { planterSchema } from './planter.schema';
import { RATE_UNITS } from '../rates/rate-units';

/**
 * Prescriptions (DEVELOPERS.md "Prescriptions"). Every rate in the API is SI: seeds/m², kg/m² or m³/m²
 * (shared/rates/rate-units.ts); `rateUnit` is only how people see and type it.
 */

export const PRESCRIPTION_STATUSES = ['draft', 'approved', 'superseded'] as const;
export const prescriptionStatusSchema = z.enum(PRESCRIPTION_STATUSES);
export type PrescriptionStatus = z.infer<typeof prescriptionStatusSchema>;
export const PRESCRIPTION_STATUS_LABELS: Record<PrescriptionStatus, string> = {
  draft: 'Draft',
  approved: 'Approved',
  superseded: 'Replaced',
};

export const rateUnitSchema = z.enum(RATE_UNITS, { message: 'Choose a rate unit' });

/** An SI rate: finite, not negative. */
export const siRateSchema = (label: string) =>
  z
    .number({ message: `${label} is required` })
    .finite(`${label} must be a number`)
    .min(0, `${label} cannot be negative`);

/* ---------------------------------------------------------------- planter check (DOMAIN.md §4) */

export const speedTripleSchema = z.object({ low: z.number(), planned: z.number(), high: z.number() });

export const ZONE_CHECK_STATUSES = ['ok', 'warning', 'flagged'] as const;
export const zoneCheckSchema = z.object({
  /** A zone id, or "default" for the default rate (what no zone covers). */
  zoneId: z.string(),
  name: z.string(),
  rateSi: z.number(),
  /** Seeds per second per row at the low, planned and high ground speed. */
  seedsPerSecondPerRow: speedTripleSchema,
  /** Disc rpm at the low, planned and high ground speed. */
  discRpm: speedTripleSchema,
  /** Speeds (m/s) between which the disc stays inside its limits: [at min rpm, at max rpm]. */
  slowestSpeedMps: z.number(),
  fastestSpeedMps: z.number(),
  /**
   * ok: inside the limits at every planned speed; warning: outside at the low or high speed only;
   * flagged: outside at the planned speed (blocks approval until accepted with a reason).
   */
  status: z.enum(ZONE_CHECK_STATUSES),
  /** Plain sentences, e.g. "At 5.0 mph the disc must turn 52.1 rpm, above its 45 rpm: deliverable up to 4.3 mph". */
  messages: z.array(z.string()),
});
export type ZoneCheck = z.infer<typeof zoneCheckSchema>;

export const planterCheckSchema = z.object({
  planterId: idSchema,
  planterName: z.string(),
  crop: cropSchema,
  /** Null when the planter has no holes-per-disc setting for the crop (then the check is flagged). */
  holesPerDisc: z.number().nullable(),
  speedsMps: speedTripleSchema,
  sections: z.object({ count: z.number(), limit: z.number(), rowsPerSection: z.number(), ok: z.boolean() }),
  zones: z.array(zoneCheckSchema),
  /** Problems not tied to a zone (no disc setting for the crop, too many sections). */
  messages: z.array(z.string()),
  /** True when anything is flagged: approval needs an accepted reason. */
  blocking: z.boolean(),
});
export type PlanterCheck = z.infer<typeof planterCheckSchema>;

/* ---------------------------------------------------------------- totals (DOMAIN.md §3) */

export const totalsLineSchema = z.object({
  /** Zone id, or "default" for the area no zone covers. */
  zoneId: z.string(),
  name: z.string(),
  areaM2: z.number(),
  rateSi: z.number(),
  /** Seeds, kg or m³. */
  quantity: z.number(),
  /** Purchase units, not rounded. */
  units: z.number(),
  /** units × price; null without a price. */
  cost: z.number().nullable(),
});
export const prescriptionTotalsSchema = z.object({
  lines: z.array(totalsLineSchema),
  field: z.object({
    areaM2: z.number(),
    /** Area-weighted mean rate (SI). */
    meanRateSi: z.number(),
    quantity: z.number(),
    units: z.number(),
    /** Whole units for this field (rounded up). */
    unitsToOrder: z.number(),
    /** unitsToOrder × price; null without a price. */
    cost: z.number().nullable(),
  }),
});
export type PrescriptionTotals = z.infer<typeof prescriptionTotalsSchema>;

/* ---------------------------------------------------------------- the prescription */

export const prescriptionZoneSchema = z.object({
  id: idSchema,
  /** The zone of the zone map it was copied from (null if that zone was deleted since). */
  sourceZoneId: idSchema.nullable(),
  name: z.string(),
  classValue: z.number().nullable(),
  productivityIndex: z.number().nullable(),
  isDefault: z.boolean(),
  areaM2: z.number(),
  rateSi: z.number(),
  geometry: multiPolygonGeometrySchema,
});
export type PrescriptionZone = z.infer<typeof prescriptionZoneSchema>;

export const personRefSchema = z.object({ id: idSchema, name: z.string() });

export const checkAcceptanceSchema = z.object({
  reason: z.string(),
  acceptedBy: personRefSchema,
  acceptedAt: z.string(),
  /** Zone ids ("default" included) that were flagged when it was accepted. */
  zoneIds: z.array(z.string()),
});

export const prescriptionSchema = z.object({
  id: idSchema,
  /** Versions of one prescription share a lineage; versionNo counts them from 1. */
  lineageId: idSchema,
  versionNo: z.number().int(),
  status: prescriptionStatusSchema,
  name: z.string(),
  growerId: idSchema,
  growerName: z.string(),
  farmName: z.string(),
  fieldId: idSchema,
  fieldName: z.string(),
  seasonId: idSchema,
  seasonLabel: z.string(),
  crop: cropSchema,
  zoneMapId: idSchema,
  zoneMapName: z.string(),
  zoneMapVersionNo: z.number(),
  /** The live product for a draft; the product as it was at approval for an approved version. */
  product: productSchema,
  /** Same rule as product. Null when none chosen (then no planter check). */
  planter: planterSchema.nullable(),
  rateUnit: rateUnitSchema,
  defaultRateSi: z.number(),
  outOfFieldRateSi: z.number(),
  minRateSi: z.number(),
  maxRateSi: z.number(),
  boundary: multiPolygonGeometrySchema,
  boundaryAreaM2: z.number(),
  zones: z.array(prescriptionZoneSchema),
  /** Boundary area no zone covers (planted at the default rate). */
  uncoveredAreaM2: z.number(),
  /** Null for a non-seed product or without a planter. */
  check: planterCheckSchema.nullable(),
  acceptance: checkAcceptanceSchema.nullable(),
  totals: prescriptionTotalsSchema,
  approvedBy: personRefSchema.nullable(),
  approvedAt: z.string().nullable(),
  supersededAt: z.string().nullable(),
  createdBy: personRefSchema.nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
  version: z.number().int(),
});
export type Prescription = z.infer<typeof prescriptionSchema>;

export const prescriptionSummarySchema = prescriptionSchema
  .pick({
    id: true,
    lineageId: true,
    versionNo: true,
    status: true,
    name: true,
    growerId: true,
    growerName: true,
    farmName: true,
    fieldId: true,
    fieldName: true,
    seasonId: true,
    seasonLabel: true,
    crop: true,
    rateUnit: true,
    approvedAt: true,
    updatedAt: true,
    version: true,
  })
  .extend({
    productId: idSchema,
    productName: z.string(),
    zoneCount: z.number(),
    meanRateSi: z.number(),
    areaM2: z.number(),
  });
export type PrescriptionSummary = z.infer<typeof prescriptionSummarySchema>;
export const prescriptionListSchema = z.object({ items: z.array(prescriptionSummarySchema) });
export const prescriptionListQuerySchema = listQuerySchema.omit({ archived: true }).extend({
  growerId: idSchema.optional(),
  fieldId: idSchema.optional(),
  seasonId: idSchema.optional(),
  status: prescriptionStatusSchema.optional(),
});

/* ---------------------------------------------------------------- requests */

const rateBounds = {
  defaultRateSi: siRateSchema('Default rate'),
  outOfFieldRateSi: siRateSchema('Out-of-field rate'),
  minRateSi: siRateSchema('Lowest rate'),
  maxRateSi: siRateSchema('Highest rate'),
};

function checkBounds(
  p: {
    defaultRateSi: number;
    minRateSi: number;
    maxRateSi: number;
    rates?: { zoneId: string; rateSi: number }[];
  },
  ctx: z.RefinementCtx,
) {
  if (p.minRateSi > p.maxRateSi) {
    ctx.addIssue({
      code: 'custom',
      path: ['maxRateSi'],
      message: 'The highest rate cannot be below the lowest',
    });
    return;
  }
  if (p.defaultRateSi < p.minRateSi || p.defaultRateSi > p.maxRateSi) {
    ctx.addIssue({
      code: 'custom',
      path: ['defaultRateSi'],
      message: 'The default rate must lie between the lowest and highest rate',
    });
  }
  // Per-zone bounds are checked by the server, which knows the zone names to put in the message.
}

/** A new draft: zones are copied from the zone map, every zone starts at the default rate. */
export const createPrescriptionSchema = z
  .object({
    zoneMapId: idSchema,
    productId: idSchema,
    planterId: idSchema.nullable(),
    name: nameText('Name'),
    rateUnit: rateUnitSchema,
    ...rateBounds,
  })
  .superRefine(checkBounds);

/** Saving a draft: the whole editable state with the version it was read at (409 `stale` otherwise). */
export const updatePrescriptionSchema = z
  .object({
    version: versionSchema,
    name: nameText('Name'),
    productId: idSchema,
    planterId: idSchema.nullable(),
    rateUnit: rateUnitSchema,
    ...rateBounds,
    rates: z.array(z.object({ zoneId: idSchema, rateSi: siRateSchema('Rate') })),
  })
  .superRefine(checkBounds);
export type UpdatePrescriptionBody = z.input<typeof updatePrescriptionSchema>;

export const acceptCheckSchema = z.object({
  version: versionSchema,
  reason: z
    .string({ message: 'Give a reason' })
    .trim()
    .min(10, 'Say in a sentence why the planter can be left like this (at least 10 characters)')
    .max(500, 'At most 500 characters'),
});
export const prescriptionVersionOnlySchema = z.object({ version: versionSchema });
export const prescriptionVersionQuerySchema = z.object({ version: z.coerce.number().int().min(0) });

export const PRESCRIPTION_EXPORT_FORMATS = ['geojson', 'shapefile', 'taskdata'] as const;
export const EXPORT_FORMAT_LABELS: Record<(typeof PRESCRIPTION_EXPORT_FORMATS)[number], string> = {
  geojson: 'GeoJSON',
  shapefile: 'Shapefile (zip)',
  taskdata: 'ISO 11783-10 task data (zip)',
};
export const EXPORT_LAYOUTS = ['zones', 'grid'] as const;
export const prescriptionExportQuerySchema = z.object({
  format: z.enum(PRESCRIPTION_EXPORT_FORMATS, {
    message: 'Choose format=geojson, format=shapefile or format=taskdata',
  }),
  layout: z.enum(EXPORT_LAYOUTS, { message: 'Choose layout=zones or layout=grid' }).default('zones'),
  cellSizeM: z.coerce
    .number({ message: 'Cell size must be a number of metres' })
    .min(2, 'Grid cells must be at least 2 m')
    .max(100, 'Grid cells must be at most 100 m')
    .default(10),
});

/* ---------------------------------------------------------------- seed order */

export const seedOrderQuerySchema = z.object({
  growerId: idSchema,
  year: z.coerce.number().int().min(1990).max(2100),
  /** Include drafts (marked as such) beside approved prescriptions. */
  drafts: z.enum(['true', 'false']).default('false'),
  format: z.enum(['json', 'csv']).default('json'),
});

export const seedOrderFieldSchema = z.object({
  prescriptionId: idSchema,
  prescriptionName: z.string(),
  versionNo: z.number(),
  status: prescriptionStatusSchema,
  fieldName: z.string(),
  farmName: z.string(),
  areaM2: z.number(),
  meanRateSi: z.number(),
  quantity: z.number(),
  unitsToOrder: z.number(),
  cost: z.number().nullable(),
});
export const seedOrderLineSchema = z.object({
  product: productSchema,
  fields: z.array(seedOrderFieldSchema),
  areaM2: z.number(),
  quantity: z.number(),
  /** Sum of each field's whole units. */
  unitsByField: z.number(),
  /** Whole units for the grower's total (ceil of the summed quantity): never more than unitsByField. */
  unitsAcrossFields: z.number(),
  /** unitsAcrossFields × price; null without a price. */
  cost: z.number().nullable(),
});
export const seedOrderSchema = z.object({
  growerId: idSchema,
  growerName: z.string(),
  year: z.number(),
  lines: z.array(seedOrderLineSchema),
  generatedAt: z.string(),
});
export type SeedOrder = z.infer<typeof seedOrderSchema>;
