import type { MultiPolygon } from 'geojson';
import type {
  AuditResult,
  CleaningReport,
  CleaningSettings,
  ColumnMapping,
} from '../../shared/schemas/as-applied.schema';
import type { RateUnit } from '../../shared/rates/rate-units';
import type { UnitSystem } from '../../shared/units';
import { parseLogCsv } from '../../shared/audit/csv-log';
import { cleanLog } from '../../shared/audit/clean-log';
import { zoneIndexOf } from '../../shared/audit/zone-join';
import { auditLog } from '../../shared/audit/audit-log';
import { findingsOf } from '../../shared/audit/findings';
import { SPEED_SOURCE_CODE, type LogColumns } from '../../shared/audit/log-columns';
import { pointsFileToCsv } from './points-to-csv';
import { logbookTotals, type LogbookTotals } from '../../shared/audit/logbook';

export type PipelineStage = 'reading' | 'cleaning' | 'auditing';

export type PipelineInput = {
  bytes: Uint8Array;
  fileName: string;
  format: 'csv' | 'geojson' | 'shapefile';
  mapping: ColumnMapping;
  cleaning: CleaningSettings;
  boundary: MultiPolygon;
  zones: { zoneId: string; name: string; targetSi: number; geometry: MultiPolygon }[];
  defaultTargetSi: number;
  bandFraction: number;
  fallbackWidthM: number;
  meteredOn: 'wheel' | 'radar' | 'gnss';
  unitSize: number;
  pricePerUnit: number | null;
  findings: {
    rateUnit: RateUnit;
    unitSystem: UnitSystem;
    unitName: string;
    currency: string;
    productKind: 'seed' | 'other';
  };
};

export type PipelineOutput = {
  pointsRead: number;
  columns: LogColumns;
  zone: Int16Array;
  removedBy: Uint8Array;
  trueApplied: Float64Array | null;
  area: Float64Array;
  report: CleaningReport;
  result: AuditResult;
  meteredOn: 'wheel' | 'radar' | 'gnss';
  /** What the log adds to the planter's lifetime counters. */
  logbook: LogbookTotals;
};

/** The speed the controller metered on: the log's own speed-source column when it has one, else the setting. */
function meteredOnOf(c: LogColumns, keep: Uint8Array, fallback: PipelineInput['meteredOn']) {
  if (!c.speedSource) return fallback;
  const counts = [0, 0, 0, 0];
  for (let i = 0; i < c.n; i++) if (keep[i]) counts[c.speedSource[i]]++;
  const best = [1, 2, 3].reduce((a, b) => (counts[b] > counts[a] ? b : a), 1);
  if (counts[best] === 0) return fallback;
  return (Object.keys(SPEED_SOURCE_CODE) as (keyof typeof SPEED_SOURCE_CODE)[]).find(
    (k) => SPEED_SOURCE_CODE[k] === best,
  ) as PipelineInput['meteredOn'];
}

/**
 * File bytes → the audit: parse (our own tokenizer), clean in FORMATS.md's order, join points to zones,
 * aggregate by area. Pure apart from reading zipped shapefiles; runs inside a worker thread.
 */
export async function runPipeline(
  input: PipelineInput,
  progress: (stage: PipelineStage, fraction: number) => void = () => {},
): Promise<PipelineOutput> {
  progress('reading', 0);
  const csv = input.format === 'csv' ? input.bytes : await pointsFileToCsv(input.bytes, input.fileName);
  const parsed = parseLogCsv(csv, input.mapping, { onProgress: (f) => progress('reading', f) });
  progress('cleaning', 0);
  const zonesGeo = input.zones.map((z) => z.geometry);
  const rawZone = zoneIndexOf(parsed.lon, parsed.lat, zonesGeo, input.boundary);
  const cleaned = cleanLog(parsed, input.cleaning, rawZone);
  const zone =
    cleaned.zone ?? zoneIndexOf(cleaned.columns.lon, cleaned.columns.lat, zonesGeo, input.boundary);
  progress('auditing', 0);
  const meteredOn = meteredOnOf(cleaned.columns, cleaned.keep, input.meteredOn);
  const audited = auditLog({
    columns: cleaned.columns,
    keep: cleaned.keep,
    zone,
    zones: input.zones.map(({ zoneId, name, targetSi }) => ({ zoneId, name, targetSi })),
    defaultTargetSi: input.defaultTargetSi,
    bandFraction: input.bandFraction,
    fallbackWidthM: input.fallbackWidthM,
    meteredOn,
    unitSize: input.unitSize,
    pricePerUnit: input.pricePerUnit,
  });
  const { trueApplied, area, ...result } = audited;
  const findings = findingsOf(result, input.findings);
  progress('auditing', 1);
  return {
    pointsRead: parsed.n,
    columns: cleaned.columns,
    zone,
    removedBy: cleaned.removedBy,
    trueApplied,
    area,
    report: cleaned.report,
    result: { ...result, findings },
    meteredOn,
    logbook: logbookTotals(cleaned.columns, cleaned.removedBy, area, trueApplied, input.fallbackWidthM),
  };
}
