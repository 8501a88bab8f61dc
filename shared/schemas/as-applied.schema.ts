import { z } from 'zod';
import { idSchema } from './common.schema';
import { RATE_UNITS } from '../rates/rate-units';
import { GROUND_SPEED_SOURCES } from './planter.schema';

/**
 * As-applied logs and the planting audit (DEVELOPERS.md "As-applied logs and the audit"). Rates are SI
 * (seeds/m², kg/m², m³/m²), speeds m/s, lengths m, times seconds since the Unix epoch (UTC).
 */

/* ---------------------------------------------------------------- column mapping */

/** What a column of a log can mean. time, lon, lat, target and applied are required. */
export const LOG_FIELDS = [
  'time',
  'lon',
  'lat',
  'heading',
  'target',
  'applied',
  'speed',
  'wheelSpeed',
  'gnssSpeed',
  'speedSource',
  'width',
  'sectionsOn',
  'workOn',
] as const;
export type LogField = (typeof LOG_FIELDS)[number];
export const REQUIRED_LOG_FIELDS: LogField[] = ['time', 'lon', 'lat', 'target', 'applied'];
export const LOG_FIELD_LABELS: Record<LogField, string> = {
  time: 'Time',
  lon: 'Longitude',
  lat: 'Latitude',
  heading: 'Heading',
  target: 'Target rate',
  applied: 'Applied rate',
  speed: 'Ground speed (one source)',
  wheelSpeed: 'Wheel or radar speed',
  gnssSpeed: 'GNSS speed',
  speedSource: 'Speed source in use',
  width: 'Working width',
  sectionsOn: 'Sections or rows on',
  workOn: 'Planting (work switch)',
};

export const TIME_UNITS = ['iso', 'epoch-s', 'epoch-ms'] as const;
export const SPEED_UNITS = ['mph', 'km/h', 'm/s'] as const;
export const WIDTH_UNITS = ['ft', 'in', 'm'] as const;
export const HEADING_UNITS = ['deg'] as const;
export const COUNT_UNITS = ['count', 'of-total'] as const;
/** The unit each field's column may be in (null: no unit, e.g. lon/lat degrees, speed source text, work 0/1). */
export const LOG_FIELD_UNITS: Record<LogField, readonly string[] | null> = {
  time: TIME_UNITS,
  lon: null,
  lat: null,
  heading: HEADING_UNITS,
  target: RATE_UNITS,
  applied: RATE_UNITS,
  speed: SPEED_UNITS,
  wheelSpeed: SPEED_UNITS,
  gnssSpeed: SPEED_UNITS,
  speedSource: null,
  width: WIDTH_UNITS,
  sectionsOn: COUNT_UNITS,
  workOn: null,
};

/** Per-row values a log may carry (issue "diagnostics" reads them). */
export const ROW_VALUE_KINDS = ['population', 'singulation', 'load', 'vacuum', 'spacing'] as const;
export type RowValueKind = (typeof ROW_VALUE_KINDS)[number];

export const columnMappingSchema = z
  .object({
    fields: z.partialRecord(
      z.enum(LOG_FIELDS),
      z.object({ column: z.string().min(1), unit: z.string().nullable() }),
    ),
    rows: z
      .array(
        z.object({
          column: z.string().min(1),
          row: z.number().int().min(1).max(96),
          kind: z.enum(ROW_VALUE_KINDS),
        }),
      )
      .default([]),
  })
  .superRefine((m, ctx) => {
    for (const f of REQUIRED_LOG_FIELDS) {
      if (!m.fields[f])
        ctx.addIssue({
          code: 'custom',
          path: ['fields', f],
          message: `Choose the column for ${LOG_FIELD_LABELS[f].toLowerCase()}`,
        });
    }
    for (const [f, spec] of Object.entries(m.fields)) {
      const units = LOG_FIELD_UNITS[f as LogField];
      if (units && (!spec?.unit || !units.includes(spec.unit))) {
        ctx.addIssue({
          code: 'custom',
          path: ['fields', f, 'unit'],
          message: `Choose the unit of ${LOG_FIELD_LABELS[f as LogField].toLowerCase()}: ${units.join(', ')}`,
        });
      }
    }
  });
export type ColumnMapping = z.output<typeof columnMappingSchema>;

/* ---------------------------------------------------------------- cleaning (FORMATS.md, in this order) */

export const CLEANING_STEPS = [
  'sort-dedupe',
  'work-off',
  'speed',
  'pass-ends',
  'target-change',
  'plausibility',
  'boundary',
] as const;
export type CleaningStep = (typeof CLEANING_STEPS)[number];
export const CLEANING_STEP_LABELS: Record<CleaningStep, string> = {
  'sort-dedupe': 'Sorted by time; repeated times dropped',
  'work-off': 'Planter not working (work switch off or no sections on)',
  speed: 'Speed out of range or changing abruptly (stops, starts)',
  'pass-ends': 'Seconds after a pass starts, before it ends, and in turns',
  'target-change': 'Window after each change of target rate (controller catching up)',
  plausibility: 'Applied ÷ target outside the plausible range',
  boundary: 'Outside the field boundary',
};

export const cleaningSettingsSchema = z.object({
  minSpeedMps: z.number().min(0).max(5).default(0.9), // about 2 mph
  maxSpeedMps: z.number().min(1).max(15).default(5.4), // about 12 mph
  /** Largest speed change between consecutive points, m/s per second. */
  maxAccelMps2: z.number().min(0.1).max(10).default(1.5),
  trimPassStartS: z.number().min(0).max(30).default(3),
  trimPassEndS: z.number().min(0).max(30).default(2),
  /** Heading change rate above which a point is in a turn, degrees per second. */
  turnDegPerS: z.number().min(1).max(180).default(20),
  /** A gap longer than this splits passes, seconds. */
  passGapS: z.number().min(1).max(600).default(5),
  afterTargetChangeS: z.number().min(0).max(30).default(3),
  plausibleRatioMin: z.number().min(0).max(1).default(0.3),
  plausibleRatioMax: z.number().min(1).max(10).default(3),
  clipToBoundary: z.boolean().default(true),
  /** Alarm replay: the delay before an alarm sounds, and a second delay to compare (common practice: 2 s, 30 s). */
  alarmDelayS: z.number().min(0).max(600).default(2),
  compareAlarmDelayS: z.number().min(0).max(600).default(30),
  /** Cell size of the coverage raster, m. */
  coverageCellM: z.number().min(0.25).max(10).default(1),
});
export type CleaningSettings = z.output<typeof cleaningSettingsSchema>;

export const cleaningReportSchema = z.array(
  z.object({
    step: z.enum(CLEANING_STEPS),
    label: z.string(),
    setting: z.string(),
    removed: z.number().int(),
  }),
);
export type CleaningReport = z.infer<typeof cleaningReportSchema>;

/* ---------------------------------------------------------------- audit results (DOMAIN.md §5, §6) */

export const auditStatsSchema = z.object({
  /** Planted area (swath width × distance) of the kept points, m². */
  areaM2: z.number(),
  points: z.number().int(),
  meanTargetSi: z.number(),
  meanAppliedSi: z.number(),
  /** (mean applied − mean target) / mean target × 100. */
  biasPct: z.number(),
  rmseSi: z.number(),
  /** Coefficient of variation of applied ÷ target, %. */
  cvPct: z.number(),
  /** Share (0–1) of the area with |applied − target| / target within the band. */
  inBandShare: z.number(),
  areaOverM2: z.number(),
  areaUnderM2: z.number(),
  /** Σ (applied − target) × area: seeds (kg, m³) more (+) or fewer (−) than prescribed. */
  quantityDelta: z.number(),
  unitsDelta: z.number(),
  costDelta: z.number().nullable(),
});
export type AuditStats = z.infer<typeof auditStatsSchema>;

export const speedErrorSchema = z.object({
  /** The speed the controller metered on (from the log's speed-source column, else the planter profile). */
  meteredOn: z.enum(GROUND_SPEED_SOURCES),
  /** Area-weighted mean slip 1 − v_gnss / v_wheel (ASABE S296; DOMAIN.md §5), as a fraction. */
  meanSlip: z.number(),
  /** True applied ÷ logged applied − 1 over the field, as a fraction (10 % slip → +11.1 %). */
  populationError: z.number(),
  /** Σ (true − logged) × area: seed the log does not show. */
  quantityHidden: z.number(),
  unitsHidden: z.number(),
  costHidden: z.number().nullable(),
  /** Area where |slip| exceeded 5 %, m². */
  areaSlipOver5PctM2: z.number(),
});
export type SpeedError = z.infer<typeof speedErrorSchema>;

export const FINDING_KINDS = [
  'speed-source',
  'bias',
  'out-of-band',
  'zone-off',
  'disc-limit',
  'lag',
  'row',
  'coverage',
  'alarm',
  'note',
] as const;
export const findingSchema = z.object({
  kind: z.enum(FINDING_KINDS),
  severity: z.enum(['info', 'notice', 'problem']),
  /** One plain sentence with the figures in the reader's units. */
  text: z.string(),
  zoneId: z.string().nullable().default(null),
});
export type Finding = z.infer<typeof findingSchema>;

/* ---------------------------------------------------------------- diagnostics (DOMAIN.md §4–§7) */

export const alarmSchema = z.object({
  startT: z.number(),
  endT: z.number(),
  durationS: z.number(),
  lon: z.number(),
  lat: z.number(),
  /** Zone index (as the zone join gives it) where it began: −1 no zone, −2 outside. */
  zone: z.number().int(),
  direction: z.enum(['over', 'under']),
});
export const alarmReplaySchema = z.object({
  bandFraction: z.number(),
  delayS: z.number(),
  /** At most 500 listed; `count` has them all. */
  alarms: z.array(alarmSchema),
  count: z.number().int(),
  outOfBandTimeS: z.number(),
  outOfBandAreaM2: z.number(),
  /** Out of band while no alarm sounded (episodes shorter than the delay, and each alarm's first seconds). */
  unreportedTimeS: z.number(),
  unreportedAreaM2: z.number(),
});
export type AlarmReplay = z.infer<typeof alarmReplaySchema>;

export const controllerLagSchema = z.object({
  /** Target steps used (a change of at least 5 % held for a few seconds on both sides). */
  transitions: z.number().int(),
  /** Median latency, s; null when no usable transition. */
  latencyS: z.number().nullable(),
  /** Interquartile range of the per-transition latencies, s. */
  spreadS: z.number().nullable(),
  /** Distance planted at the old rate at each zone edge: median speed × latency (DOMAIN.md §6). */
  metresAtOldRate: z.number().nullable(),
  /** Area and quantity planted at the old rate over all transitions. */
  areaAffectedM2: z.number(),
  quantityAffected: z.number(),
  /** How far ahead a controller would have to look to compensate (= the latency), s. */
  leadS: z.number().nullable(),
  perTransition: z.array(z.object({ t: z.number(), latencyS: z.number() })),
});
export type ControllerLag = z.infer<typeof controllerLagSchema>;

export const discLimitSchema = z.object({
  zones: z.array(
    z.object({
      zoneId: z.string(),
      name: z.string(),
      targetSi: z.number(),
      /** Area where applied fell short by more than half the band while the disc was at its top rpm at the driven speed. */
      areaM2: z.number(),
      shortfallPct: z.number(),
      drivenSpeedMps: z.number(),
      /** The speed at which the disc would have delivered the target (DOMAIN.md §4). */
      fastestSpeedMps: z.number(),
    }),
  ),
});
export type DiscLimit = z.infer<typeof discLimitSchema>;

export const rowDiagnosticSchema = z.object({
  kind: z.enum(ROW_VALUE_KINDS),
  rows: z.array(
    z.object({ row: z.number().int(), mean: z.number(), robustZ: z.number(), flagged: z.boolean() }),
  ),
  median: z.number(),
  mad: z.number(),
  /** Rows whose |mean − median| / (1.4826 × MAD) exceeds this are flagged. */
  threshold: z.number(),
  /** Kachman & Smith (1995) indices when the kind is spacing (DOMAIN.md §7), in %. */
  uniformity: z
    .object({
      xRef: z.number(),
      multiples: z.number(),
      misses: z.number(),
      quality: z.number(),
      precision: z.number(),
    })
    .nullable(),
});
export type RowDiagnostic = z.infer<typeof rowDiagnosticSchema>;

export const coverageSchema = z.object({
  cellSizeM: z.number(),
  fieldM2: z.number(),
  plantedM2: z.number(),
  skippedM2: z.number(),
  doubleM2: z.number(),
  /** Seed (kg, m³) put down a second time in overlaps. */
  quantityInOverlap: z.number(),
  /** The raster for the map: south-west origin, cell size in degrees, row 0 south; counts 0 = skipped, 1 = once, 2+ = over; 255 outside. */
  raster: z.object({
    minLon: z.number(),
    minLat: z.number(),
    cellLonDeg: z.number(),
    cellLatDeg: z.number(),
    columns: z.number().int(),
    rows: z.number().int(),
    countsBase64: z.string(),
  }),
  /** A section layout that would have cut the overlap, when the log says which sections were on. */
  sectionAdvice: z
    .object({
      rowsPerSection: z.number().int(),
      sections: z.number().int(),
      overlapCutM2: z.number(),
      withinDisplayLimit: z.boolean(),
    })
    .nullable(),
});
export type Coverage = z.infer<typeof coverageSchema>;

export const diagnosticsSchema = z.object({
  /** Alarm replay at the two settings compared (default ±15 % with 2 s and with 30 s). */
  alarms: z.array(alarmReplaySchema),
  lag: controllerLagSchema.nullable(),
  discLimit: discLimitSchema.nullable(),
  rows: z.array(rowDiagnosticSchema),
  coverage: coverageSchema.nullable(),
});
export type Diagnostics = z.infer<typeof diagnosticsSchema>;

export const auditResultSchema = z.object({
  bandFraction: z.number(),
  /** Statistics of the rate the log records. */
  field: auditStatsSchema,
  /** The same with the applied rate corrected for the speed error; null without both speeds. */
  fieldTrue: auditStatsSchema.nullable(),
  zones: z.array(
    z.object({
      zoneId: z.string(),
      name: z.string(),
      targetSi: z.number(),
      stats: auditStatsSchema,
      statsTrue: auditStatsSchema.nullable(),
    }),
  ),
  speed: speedErrorSchema.nullable(),
  /** Area by applied ÷ target bin. */
  histogram: z.array(z.object({ from: z.number(), to: z.number(), areaM2: z.number() })),
  /** Wheel and GNSS speed over time, thinned to at most 2 000 samples. */
  speedSeries: z.array(
    z.object({ t: z.number(), wheelMps: z.number().nullable(), gnssMps: z.number().nullable() }),
  ),
  findings: z.array(findingSchema),
  /** The deeper diagnostics; absent on audits made before they existed. */
  diagnostics: diagnosticsSchema.optional(),
});
export type AuditResult = z.infer<typeof auditResultSchema>;

/* ---------------------------------------------------------------- API shapes */

export const LOG_STATUSES = [
  'queued',
  'reading',
  'cleaning',
  'storing',
  'auditing',
  'ready',
  'failed',
] as const;
export const logStatusSchema = z.enum(LOG_STATUSES);
export type LogStatus = z.infer<typeof logStatusSchema>;

export const logPreviewSchema = z.object({
  fileId: idSchema,
  fileName: z.string(),
  sizeBytes: z.number(),
  format: z.enum(['csv', 'geojson', 'shapefile']),
  columns: z.array(z.string()),
  sample: z.array(z.array(z.string())),
  suggested: columnMappingSchema,
  /** The mapping last used for this planter, when there is one. */
  remembered: columnMappingSchema.nullable(),
  /** A log already made from these same bytes for this field. */
  existingLogId: idSchema.nullable(),
});

export const createLogSchema = z.object({
  fileId: idSchema,
  prescriptionId: idSchema,
  planterId: idSchema,
  mapping: columnMappingSchema,
  /** What the controller metered on, when the log has no speed-source column. */
  meteredOn: z.enum(GROUND_SPEED_SOURCES),
});

export const logSchema = z.object({
  id: idSchema,
  growerId: idSchema,
  fieldId: idSchema,
  fieldName: z.string(),
  seasonId: idSchema,
  seasonLabel: z.string(),
  planterId: idSchema,
  planterName: z.string(),
  prescriptionId: idSchema,
  prescriptionLabel: z.string(),
  fileName: z.string(),
  sizeBytes: z.number(),
  status: logStatusSchema,
  /** 0–1 within the current status. */
  progress: z.number(),
  error: z.object({ line: z.number().nullable(), message: z.string() }).nullable(),
  pointsRead: z.number().nullable(),
  pointsKept: z.number().nullable(),
  cleaning: cleaningSettingsSchema,
  cleaningReport: cleaningReportSchema.nullable(),
  startedAt: z.string().nullable(),
  finishedAt: z.string().nullable(),
  createdAt: z.string(),
  version: z.number(),
});
export type Log = z.infer<typeof logSchema>;

export const auditCommentSchema = z.object({
  id: idSchema,
  author: z.object({ id: idSchema, name: z.string(), role: z.string() }),
  body: z.string(),
  createdAt: z.string(),
});

export const auditSchema = z.object({
  id: idSchema,
  logId: idSchema,
  status: z.enum(['open', 'signed-off']),
  bandFraction: z.number(),
  result: auditResultSchema,
  signedOffBy: z.object({ id: idSchema, name: z.string() }).nullable(),
  signedOffAt: z.string().nullable(),
  comments: z.array(auditCommentSchema),
  version: z.number(),
  updatedAt: z.string(),
});
export type Audit = z.infer<typeof auditSchema>;
